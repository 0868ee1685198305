"""shaftsys.report."""
