//! Conversions of monomial orders and run limits from their Python forms.
//!
//! Orders arrive as `"lex"`, `"grlex"`, `"grevlex"`, `("weight", [w...], tie)` or
//! `("block", [(order, [variable indices]), ...])`.

use fibrewise_core::control::Limits;
use fibrewise_core::order::{MonomialOrder, OrderBlock};
use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use pyo3::types::{PyString, PyTuple};
use std::time::Duration;

pub fn order_from_py(spec: &Bound<'_, PyAny>, nvars: usize) -> PyResult<MonomialOrder> {
    let order = parse_order(spec)?;
    order.validate(nvars).map_err(crate::errors::to_py)?;
    Ok(order)
}

fn parse_order(spec: &Bound<'_, PyAny>) -> PyResult<MonomialOrder> {
    if let Ok(name) = spec.downcast::<PyString>() {
        return MonomialOrder::by_name(name.to_str()?).map_err(crate::errors::to_py);
    }
    let tuple = spec.downcast::<PyTuple>().map_err(|_| {
        PyValueError::new_err(
            "a monomial order must be 'lex', 'grlex', 'grevlex', a BlockOrder or a WeightOrder",
        )
    })?;
    let kind: String = tuple.get_item(0)?.extract()?;
    match kind.as_str() {
        "weight" => {
            let weights: Vec<u64> = tuple.get_item(1)?.extract().map_err(|_| {
                PyValueError::new_err("weight order: weights must be non-negative integers")
            })?;
            let tie = parse_order(&tuple.get_item(2)?)?;
            Ok(MonomialOrder::Weight {
                weights,
                tie: Box::new(tie),
            })
        }
        "block" => {
            let mut blocks = Vec::new();
            for item in tuple.get_item(1)?.try_iter()? {
                let (order, vars): (Bound<'_, PyAny>, Vec<usize>) = item?.extract()?;
                blocks.push(OrderBlock {
                    order: parse_order(&order)?,
                    vars,
                });
            }
            Ok(MonomialOrder::Block(blocks))
        }
        other => Err(PyValueError::new_err(format!(
            "unknown monomial order kind '{other}'"
        ))),
    }
}

pub fn limits(
    max_degree: Option<u32>,
    max_matrix: Option<u64>,
    threads: Option<usize>,
) -> PyResult<Limits> {
    if threads == Some(0) {
        return Err(PyValueError::new_err("threads must be at least 1"));
    }
    Ok(Limits {
        max_degree,
        max_matrix_entries: max_matrix,
        threads,
        max_time: None,
    })
}

/// `limits` with a time limit of `max_seconds` (a positive, finite number of seconds).
pub fn with_time_limit(limits: Limits, max_seconds: Option<f64>) -> PyResult<Limits> {
    let Some(seconds) = max_seconds else {
        return Ok(limits);
    };
    let max_time = Duration::try_from_secs_f64(seconds)
        .ok()
        .filter(|_| seconds > 0.0)
        .ok_or_else(|| {
            PyValueError::new_err(format!(
                "max_seconds must be a positive finite number of seconds, not {seconds}"
            ))
        })?;
    Ok(Limits {
        max_time: Some(max_time),
        ..limits
    })
}
