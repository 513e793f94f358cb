"""Report: Design → words and formatted values shared by the terminal, JSON and the PDF (no reportlab)."""
