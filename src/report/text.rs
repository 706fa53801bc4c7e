use super::Report;
pub fn render_text(report: &Report, _color: bool) -> String {
    report.title.clone()
}
