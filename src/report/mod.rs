//! Complaint reports: Markdown, self-contained HTML with SVG plots, JSON, CSV.
