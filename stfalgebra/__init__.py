"""stfalgebra: exact symbolic algebra of multipolar post-Newtonian expansions."""
__version__ = "0.1.0"
