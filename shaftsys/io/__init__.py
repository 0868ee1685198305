"""shaftsys.io."""
