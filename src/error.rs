//! User-facing errors. Input problems are collected as a list of
//! diagnostics (file, line, column, message, hint) so a user sees every
//! problem of a file at once, the way a compiler reports them.

use std::fmt;
use std::path::{Path, PathBuf};

/// One problem in one input file.
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord)]
pub struct Diagnostic {
    pub file: PathBuf,
    /// 1-based line, when known.
    pub line: Option<usize>,
    /// 1-based column, when known.
    pub column: Option<usize>,
    pub message: String,
    /// Optional suggestion, e.g. "did you mean `reactions`?".
    pub hint: Option<String>,
}

impl Diagnostic {
    pub fn new(file: &Path, message: impl Into<String>) -> Diagnostic {
        Diagnostic {
            file: file.to_path_buf(),
            line: None,
            column: None,
            message: shorten(message.into()),
            hint: None,
        }
    }

    pub fn at(mut self, line: usize, column: usize) -> Diagnostic {
        self.line = Some(line);
        self.column = Some(column);
        self
    }

    pub fn at_opt(mut self, location: Option<(usize, usize)>) -> Diagnostic {
        if let Some((line, column)) = location {
            self.line = Some(line);
            self.column = Some(column);
        }
        self
    }

    pub fn hint(mut self, hint: impl Into<String>) -> Diagnostic {
        self.hint = Some(shorten(hint.into()));
        self
    }
}

/// Longest `quoted` value echoed whole in a message.
pub const MAX_ECHO: usize = 120;
/// Longest message kept whole.
const MAX_MESSAGE: usize = 2_000;

/// Messages echo the user's values between backticks; a 50 MB id must not
/// become a 50 MB line on stderr. Long quoted values keep their start and
/// say how long they were; an overlong message is cut.
pub fn shorten(message: String) -> String {
    if message.len() <= MAX_ECHO {
        return message;
    }
    let parts: Vec<&str> = message.split('`').collect();
    let mut out = String::with_capacity(message.len().min(MAX_MESSAGE + 64));
    let mut shortened: Option<usize> = None;
    for (i, part) in parts.iter().enumerate() {
        if i > 0 {
            out.push('`');
        }
        if let Some(bytes) = shortened.take() {
            out.push_str(&format!(
                " ({} bytes)",
                crate::project::read::group(bytes as u64)
            ));
        }
        // Odd parts with a closing backtick after them are quoted values.
        let quoted = i % 2 == 1 && i + 1 < parts.len();
        if quoted && part.len() > MAX_ECHO {
            out.push_str(cut(part, MAX_ECHO / 2));
            out.push('…');
            shortened = Some(part.len());
        } else {
            out.push_str(part);
        }
    }
    if out.len() > MAX_MESSAGE {
        format!(
            "{}… ({} bytes in all)",
            cut(&out, MAX_MESSAGE),
            crate::project::read::group(out.len() as u64)
        )
    } else {
        out
    }
}

/// The longest prefix of `text` of at most `bytes` bytes on a char boundary.
fn cut(text: &str, bytes: usize) -> &str {
    let mut end = bytes.min(text.len());
    while !text.is_char_boundary(end) {
        end -= 1;
    }
    &text[..end]
}

impl fmt::Display for Diagnostic {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.file.display())?;
        if let Some(line) = self.line {
            write!(f, ":{line}")?;
            if let Some(column) = self.column {
                write!(f, ":{column}")?;
            }
        }
        write!(f, ": error: {}", self.message)?;
        if let Some(hint) = &self.hint {
            write!(f, "\n  hint: {hint}")?;
        }
        Ok(())
    }
}

/// Everything that can stop a run. Writing the output failing
/// ([`Error::Output`]: disk full, permission) maps to exit code 3, so CI can
/// tell "fix your runner" from "fix your model"; everything else to 2.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// One or more problems in the user's input files.
    #[error("{}", format_diagnostics(.0))]
    Input(Vec<Diagnostic>),
    /// Reading or writing a file failed.
    #[error("{}: {source}", path.display())]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// Writing the site or an imported project failed (disk full,
    /// permission, read-only file system): the runner's problem, not the
    /// model's.
    #[error("{}: cannot write: {source}", path.display())]
    Output {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// A theme template failed to render.
    #[error("rendering {template}: {message}")]
    Render { template: String, message: String },
}

fn format_diagnostics(diagnostics: &[Diagnostic]) -> String {
    let mut out = String::new();
    for (i, d) in diagnostics.iter().enumerate() {
        if i > 0 {
            out.push('\n');
        }
        out.push_str(&d.to_string());
    }
    if diagnostics.len() > 1 {
        out.push_str(&format!("\n{} problems found", diagnostics.len()));
    }
    out
}

impl Error {
    pub fn io(path: &Path, source: std::io::Error) -> Error {
        Error::Io {
            path: path.to_path_buf(),
            source,
        }
    }

    pub fn output(path: &Path, source: std::io::Error) -> Error {
        Error::Output {
            path: path.to_path_buf(),
            source,
        }
    }

    /// The process exit code for this error: 3 for output failures, 2 for
    /// bad input or usage.
    pub fn exit_code(&self) -> u8 {
        match self {
            Error::Output { .. } => 3,
            _ => 2,
        }
    }

    pub fn input(diagnostic: Diagnostic) -> Error {
        Error::Input(vec![diagnostic])
    }

    /// The diagnostics of an input error (empty for other errors).
    pub fn diagnostics(&self) -> &[Diagnostic] {
        match self {
            Error::Input(d) => d,
            _ => &[],
        }
    }
}

pub type Result<T, E = Error> = std::result::Result<T, E>;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn long_echoed_values_are_shortened() {
        let id = "r".repeat(50_000);
        let d = Diagnostic::new(Path::new("m.yaml"), format!("unknown reaction `{id}` here"));
        assert_eq!(
            d.message,
            format!("unknown reaction `{}…` (50,000 bytes) here", "r".repeat(60))
        );
        let short = Diagnostic::new(Path::new("m.yaml"), "unknown reaction `R9`");
        assert_eq!(short.message, "unknown reaction `R9`");
        let long = Diagnostic::new(Path::new("m.yaml"), "é".repeat(5_000));
        assert!(long.message.len() < 2_100, "{}", long.message.len());
        assert!(long.message.ends_with("(10,000 bytes in all)"));
    }
}
