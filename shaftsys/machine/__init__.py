"""shaftsys.machine."""
