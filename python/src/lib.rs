//! `twofold._native`: the extension module behind the Python package
//! `twofold` (see `twofold/__init__.py` for the public API).
//!
//! Every report crosses into Python as exactly the JSON line that the
//! `rank --json` example prints (`RankReport::to_json`, or
//! `twofold::report::error_json` for an input that gave an error), so the
//! Python dicts and the command line share one schema and cannot drift
//! apart. The computations run with the interpreter detached (the GIL
//! released): other Python threads, Dask's among them, keep running, and
//! Ctrl-C cancels a running call through the library's cancel flag.
#![forbid(unsafe_code)]
#![deny(missing_docs)]

use pyo3::exceptions::PyValueError;
use pyo3::prelude::*;
use std::panic::{catch_unwind, AssertUnwindSafe};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{self, RecvTimeoutError};
use std::sync::Arc;
use std::time::Duration;
use twofold::batch::{analyse_batch, analyse_text, BatchOptions};
use twofold::{Error, ErrorKind, RankOptions};

/// The Python exception class (in `twofold._errors`) and the kind name
/// for an error of the library.
fn classify(kind: &ErrorKind) -> (&'static str, &'static str) {
    match kind {
        ErrorKind::Parse => ("ParseError", "parse"),
        ErrorKind::TooLarge => ("ParseError", "too_large"),
        ErrorKind::InvalidValue => ("ParseError", "invalid_value"),
        ErrorKind::Singular => ("SingularCurveError", "singular"),
        ErrorKind::Budget => ("BudgetError", "budget"),
        ErrorKind::FactorBudget => ("BudgetError", "factor_budget"),
        ErrorKind::Internal => ("InternalError", "internal"),
        _ => ("InternalError", "unknown"),
    }
}

/// Builds the Python exception for `message` of class `class`.
fn raise(py: Python<'_>, class: &str, message: String, kind: &str) -> PyErr {
    let made = py
        .import("twofold._errors")
        .and_then(|m| m.getattr(class))
        .and_then(|cls| cls.call1((message, kind)));
    match made {
        Ok(instance) => PyErr::from_value(instance),
        Err(e) => e,
    }
}

/// The Python exception for a library error; the message is the library's.
fn py_error(py: Python<'_>, e: &Error) -> PyErr {
    let (class, kind) = classify(e.kind());
    raise(py, class, e.to_string(), kind)
}

/// Per-curve options from the Python arguments.
fn rank_options(
    budget: Option<f64>,
    height: Option<u64>,
    evidence: bool,
    certificate: bool,
    cancel: &Arc<AtomicBool>,
) -> PyResult<RankOptions> {
    let mut o = RankOptions::default();
    if let Some(s) = budget {
        if !(s.is_finite() && s >= 0.0) {
            return Err(PyValueError::new_err(format!("budget must be a finite number of seconds >= 0, got {s}")));
        }
        o.time_limit = Some(Duration::from_secs_f64(s));
    }
    if let Some(h) = height {
        if h == 0 {
            return Err(PyValueError::new_err("height must be at least 1"));
        }
        o.search_height = h;
    }
    o.evidence = evidence;
    o.certificate = certificate;
    o.cancel = Some(cancel.clone());
    Ok(o)
}

/// Runs `job` on a thread of its own while the calling thread waits with
/// the interpreter detached, looking for signals (Ctrl-C) five times a
/// second; a signal sets `cancel`, which the library honours promptly, and
/// is raised once the job has stopped. A panic in the job (a bug) becomes
/// `InternalError`.
fn run_detached<T: Send>(py: Python<'_>, cancel: &Arc<AtomicBool>, job: impl FnOnce() -> T + Send) -> PyResult<T> {
    let (tx, rx) = mpsc::channel();
    std::thread::scope(|s| {
        s.spawn(move || {
            let r = catch_unwind(AssertUnwindSafe(job));
            let _ = tx.send(r);
        });
        let mut rx = rx;
        loop {
            let (back, got) = py.detach(move || {
                let got = rx.recv_timeout(Duration::from_millis(200));
                (rx, got)
            });
            rx = back;
            match got {
                Ok(Ok(v)) => return Ok(v),
                Ok(Err(_)) | Err(RecvTimeoutError::Disconnected) => {
                    return Err(raise(
                        py,
                        "InternalError",
                        "internal error: the computation panicked (a bug in twofold, not a property of the curve; please report it with the input)".into(),
                        "internal",
                    ))
                }
                Err(RecvTimeoutError::Timeout) => {
                    if let Err(signal) = py.check_signals() {
                        cancel.store(true, Ordering::Relaxed);
                        let _ = py.detach(move || rx.recv());
                        return Err(signal);
                    }
                }
            }
        }
    })
}

/// Analyses one curve given as text and returns the JSON line of
/// `rank --json` for it (`RankReport::to_json(text)`); errors are raised as
/// the exceptions of `twofold._errors`.
#[pyfunction]
#[pyo3(signature = (text, budget=None, height=None, evidence=true, certificate=false))]
fn analyse_json(
    py: Python<'_>,
    text: String,
    budget: Option<f64>,
    height: Option<u64>,
    evidence: bool,
    certificate: bool,
) -> PyResult<String> {
    let cancel = Arc::new(AtomicBool::new(false));
    let options = rank_options(budget, height, evidence, certificate, &cancel)?;
    let result = run_detached(py, &cancel, || analyse_text(&text, &options).map(|r| r.to_json(&text)))?;
    result.map_err(|e| py_error(py, &e))
}

/// Analyses many curves given as text with the library's batch runner on
/// `threads` threads (`0`: one per core), and returns one JSON line per
/// input in input order: `RankReport::to_json`, or `error_json` (keys
/// `input` and `error`) for an input that gave an error.
#[pyfunction]
#[pyo3(signature = (texts, threads=0, budget=None, height=None, evidence=true, certificate=false))]
fn analyse_many_json(
    py: Python<'_>,
    texts: Vec<String>,
    threads: usize,
    budget: Option<f64>,
    height: Option<u64>,
    evidence: bool,
    certificate: bool,
) -> PyResult<Vec<String>> {
    let cancel = Arc::new(AtomicBool::new(false));
    let options = BatchOptions::new(rank_options(budget, height, evidence, certificate, &cancel)?).with_threads(threads);
    let n = texts.len();
    let lines = run_detached(py, &cancel, || {
        let run = analyse_batch(texts.iter().map(String::as_str), &options);
        run.items
            .iter()
            .map(|item| match &item.result {
                Ok(r) => r.to_json(&item.label),
                Err(e) => twofold::report::error_json(&item.label, e),
            })
            .collect::<Vec<String>>()
    })?;
    if lines.len() != n {
        return Err(raise(
            py,
            "InternalError",
            format!("internal error: the batch returned {} results for {n} inputs", lines.len()),
            "internal",
        ));
    }
    Ok(lines)
}

/// The extension module `twofold._native`.
#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add_function(wrap_pyfunction!(analyse_json, m)?)?;
    m.add_function(wrap_pyfunction!(analyse_many_json, m)?)?;
    m.add("__version__", env!("CARGO_PKG_VERSION"))?;
    Ok(())
}
