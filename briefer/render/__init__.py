"""briefer.render"""
