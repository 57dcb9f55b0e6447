"""Input and output beyond the project file: tables and CSV, charts, files, the run ledger, the audit workbook."""
