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
            message: message.into(),
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
        self.hint = Some(hint.into());
        self
    }
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
