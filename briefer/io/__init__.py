"""briefer.io"""
