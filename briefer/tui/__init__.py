"""briefer.tui"""
