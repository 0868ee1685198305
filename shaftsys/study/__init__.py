"""shaftsys.study."""
