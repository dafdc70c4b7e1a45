//! The kinds of file a plot is offered as, with their file-name endings and media types.
//!
//! Architecture invariant: the one list of export kinds; the page's buttons, hooks and
//! download code all take an [`ExportKind`], never a string.

/// A file a plot can be downloaded as.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ExportKind {
    /// the drawing as vector graphics
    Svg,
    /// the drawing as a 1600 x 1000 bitmap
    Png,
    /// the plotted data as a table
    Csv,
}

impl ExportKind {
    pub const ALL: [ExportKind; 3] = [ExportKind::Svg, ExportKind::Png, ExportKind::Csv];

    /// The file-name ending, also the button's test hook (`data-save`).
    pub fn as_str(self) -> &'static str {
        match self {
            ExportKind::Svg => "svg",
            ExportKind::Png => "png",
            ExportKind::Csv => "csv",
        }
    }

    /// The media type of the file.
    pub fn mime(self) -> &'static str {
        match self {
            ExportKind::Svg => "image/svg+xml",
            ExportKind::Png => "image/png",
            ExportKind::Csv => "text/csv",
        }
    }

    /// The button's tooltip.
    pub fn describe(self) -> &'static str {
        match self {
            ExportKind::Svg => "Download the plot as SVG (vector)",
            ExportKind::Png => "Download the plot as PNG, 1600×1000",
            ExportKind::Csv => "Download the plotted data as CSV",
        }
    }
}

/// The file name of a plot's download: `glowgap-<slug>.<ending>`.
pub fn file_name(slug: &str, kind: ExportKind) -> String {
    format!("glowgap-{slug}.{}", kind.as_str())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_and_types() {
        assert_eq!(file_name("jv", ExportKind::Csv), "glowgap-jv.csv");
        assert_eq!(file_name("tandem-map", ExportKind::Svg), "glowgap-tandem-map.svg");
        // media types as registered with IANA (common practice, no further source)
        assert_eq!(ExportKind::Png.mime(), "image/png");
        let hooks: Vec<&str> = ExportKind::ALL.iter().map(|k| k.as_str()).collect();
        assert_eq!(hooks, ["svg", "png", "csv"]);
    }
}
