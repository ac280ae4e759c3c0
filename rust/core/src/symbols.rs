//! Fresh symbol names: names for new variables (parameters, the symbol of an equation) that
//! clash with none of a ring's variables nor its field's generator.

use crate::field::Field;
use crate::poly::Ring;

/// Names `{prefix}1..{prefix}count` for the first prefix that clashes with no name in `taken`.
pub fn fresh_symbols(prefix: &str, count: usize, taken: &[String]) -> Vec<String> {
    let mut prefix = prefix.to_string();
    loop {
        let names: Vec<String> = (1..=count).map(|k| format!("{prefix}{k}")).collect();
        if names.iter().all(|s| !taken.contains(s)) {
            return names;
        }
        prefix.push('_');
    }
}

/// Names already used by a ring: its variables and the field generator.
pub fn taken_names<F: Field>(ring: &Ring<F>) -> Vec<String> {
    let mut taken = ring.names().to_vec();
    taken.extend(ring.field.generator_name().map(String::from));
    taken
}
