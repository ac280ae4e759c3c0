//! The one error type of the core. Every variant carries a message that says what is wrong and,
//! for text input, where (1-based line and column).

use std::fmt;

#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Error {
    /// Malformed polynomial text: `line` and `column` are 1-based, the column counted in
    /// characters from the start of the line.
    Parse {
        message: String,
        line: usize,
        column: usize,
    },
    /// Input that is well formed but not acceptable (composite modulus, wrong ring, ...).
    InvalidInput(String),
    /// An exponent or degree that does not fit the monomial representation.
    Overflow(String),
    /// A computation went over a limit the caller set.
    ResourceLimit(String),
    /// The caller asked the computation to stop (Ctrl-C).
    Interrupted,
}

pub type Result<T> = std::result::Result<T, Error>;

impl Error {
    pub fn invalid(msg: impl Into<String>) -> Self {
        Error::InvalidInput(msg.into())
    }
    pub fn parse(msg: impl Into<String>, line: usize, column: usize) -> Self {
        Error::Parse {
            message: msg.into(),
            line,
            column,
        }
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Error::Parse {
                message,
                line,
                column,
            } => write!(f, "line {line}, column {column}: {message}"),
            Error::InvalidInput(m) | Error::Overflow(m) | Error::ResourceLimit(m) => f.write_str(m),
            Error::Interrupted => f.write_str("interrupted"),
        }
    }
}

impl std::error::Error for Error {}
