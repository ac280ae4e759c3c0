//! F4 against the reference engine and published counts.
