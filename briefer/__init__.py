"""briefer: computations and briefing aids for circling approaches.

Not for navigation. The published procedure, the aircraft flight manual, local rules and
licensed practice govern.
"""

__version__ = "0.1.0"
