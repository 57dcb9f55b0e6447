"""The audit workbook: layout shared by writer and reader, symbolic cells, writer (takes a result), reader."""
