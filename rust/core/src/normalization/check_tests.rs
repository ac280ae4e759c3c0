//! The certificate check against tampering: every single-field change of a genuine certificate
//! over twenty systems is rejected (unless the changed claim happens to be true, which is
//! decided independently by a Gröbner basis of the original ideal), crafted certificates with
//! huge degrees are rejected at once, and random text in any field never crashes the reader.

use super::*;
use crate::field::PrimeField;
use proptest::prelude::*;

use super::tests::{polys, ring, P};

fn check(r: &Ring<PrimeField>, gens: &[P], text: &CertificateText) -> Vec<String> {
    check_certificate(r, gens, text, &Control::new()).unwrap()
}

/// Twenty systems of every kind: variables, linear and nonlinear parameters, dimension 0 to 2,
/// homogeneous or not, free modules and modules with torsion (rank below the number of
/// generators), over GF(2) to GF(32003).
fn systems() -> Vec<(Ring<PrimeField>, Vec<P>)> {
    let list: Vec<(u64, Vec<&str>, Vec<&str>)> = vec![
        (32003, vec!["x", "y"], vec!["x*y"]),
        (2, vec!["x", "y"], vec!["x*y"]),
        (32003, vec!["x", "y"], vec!["y^2 - x^3"]),
        (32003, vec!["x", "y", "z"], vec!["y - x^2", "z - x^3"]),
        (
            32003,
            vec!["x", "y", "z", "w"],
            vec!["x*z - y^2", "y*w - z^2", "x*w - y*z"],
        ),
        (3, vec!["x", "y"], vec!["x^2 + 1", "y - x"]),
        (7, vec!["x", "y"], vec!["x^7*y - x*y^7"]),
        (2, vec!["x", "y"], vec!["x^2*y - x*y^2"]),
        (32003, vec!["x", "y", "z"], vec!["x*y - z", "x*z"]),
        (32003, vec!["x", "y"], vec!["x^2", "x*y"]),
        (101, vec!["x", "y", "z"], vec!["x^2 - y*z", "y^2 - x*z"]),
        (5, vec!["x", "y", "z"], vec!["x^3 + y^3 + z^3"]),
        (
            32003,
            vec!["x", "y", "z"],
            vec!["x^2 + y^2 + z^2 - 1", "x - y*z"],
        ),
        (7, vec!["x", "y", "z"], vec!["x*y*z - 1"]),
        (
            2,
            vec!["x", "y", "z"],
            vec!["x^2*y - x*y^2 + z", "z^2 - x*y"],
        ),
        (32003, vec!["x", "y"], vec!["x^3 - x*y + 1", "y^2 - 2"]),
        (13, vec!["x", "y", "z"], vec!["x^2*y + z^2", "y^3 - x*z"]),
        (
            32003,
            vec!["a", "b", "c", "d"],
            vec!["a*b - c*d", "a^2 - d"],
        ),
        (3, vec!["x", "y", "z"], vec!["x^3*y - x*y^3", "z^2 - x"]),
        (32003, vec!["x", "y", "z"], vec!["x^2*z - y^2", "x*y*z - 1"]),
    ];
    list.into_iter()
        .map(|(p, vars, texts)| {
            let r = ring(p, &vars);
            let gens = polys(&r, &texts);
            (r, gens)
        })
        .collect()
}

/// Every single-field change of a certificate: each scalar field, each list entry changed,
/// removed and repeated, each list emptied or given an extra entry.
fn tampers(good: &CertificateText) -> Vec<(String, CertificateText)> {
    let mut out: Vec<(String, CertificateText)> = Vec::new();
    let mut push = |what: String, f: &dyn Fn(&mut CertificateText)| {
        let mut t = good.clone();
        f(&mut t);
        out.push((what, t));
    };
    for delta in [-1i64, 1, 5] {
        push(format!("dimension {delta:+}"), &|t| t.dimension += delta);
        push(format!("rank {delta:+}"), &|t| t.rank += delta);
    }
    push("rank 0".into(), &|t| t.rank = 0);
    for s in ["variables", "linear", "nonlinear", "", "anything"] {
        push(format!("strategy {s}"), &|t| t.strategy = s.into());
    }
    push("homogeneous flipped".into(), &|t| {
        t.homogeneous = !t.homogeneous
    });
    type Field_ = fn(&mut CertificateText) -> &mut Vec<String>;
    let lists: [(&str, Field_); 6] = [
        ("parameters", |t| &mut t.parameters),
        ("parameter_symbols", |t| &mut t.parameter_symbols),
        ("coordinates", |t| &mut t.coordinates),
        ("coordinate_symbols", |t| &mut t.coordinate_symbols),
        ("inverse", |t| &mut t.inverse),
        ("module_generators", |t| &mut t.module_generators),
    ];
    for (name, field) in lists {
        let len = field(&mut good.clone()).len();
        push(format!("{name} emptied"), &|t| field(t).clear());
        push(format!("{name} extra entry"), &|t| {
            field(t).push("x_extra".into())
        });
        for k in 0..len {
            let symbolic = name.ends_with("symbols");
            push(format!("{name}[{k}] changed"), &|t| {
                let e = &mut field(t)[k];
                *e = if symbolic {
                    format!("{e}_renamed")
                } else {
                    format!("({e}) + 1")
                };
            });
            push(format!("{name}[{k}] doubled"), &|t| {
                if !symbolic {
                    let e = &mut field(t)[k];
                    *e = format!("2*({e})");
                }
            });
            push(format!("{name}[{k}] removed"), &|t| {
                field(t).remove(k);
            });
            push(format!("{name}[{k}] repeated"), &|t| {
                let e = field(t)[k].clone();
                field(t).insert(k, e);
            });
            if len > 1 {
                push(format!("{name}[{k}] replaced by another"), &|t| {
                    let other = field(t)[(k + 1) % len].clone();
                    field(t)[k] = other;
                });
            }
        }
    }
    push("equations emptied".into(), &|t| t.equations.clear());
    push("equations extra".into(), &|t| {
        t.equations.push(vec!["1".into()])
    });
    for i in 0..good.equations.len() {
        push(format!("equation {i} removed"), &|t| {
            t.equations.remove(i);
        });
        push(format!("equation {i} repeated"), &|t| {
            let e = t.equations[i].clone();
            t.equations.insert(i, e);
        });
        push(format!("equation {i} emptied"), &|t| t.equations[i].clear());
        // P·x + 1: never in the ideal when P is (the ideal is not the unit ideal).
        push(format!("equation {i} extra coefficient"), &|t| {
            t.equations[i].push("1".into())
        });
        for k in 0..good.equations[i].len() {
            push(format!("equation {i} coefficient {k} + 1"), &|t| {
                let e = &mut t.equations[i][k];
                *e = format!("({e}) + 1");
            });
            push(format!("equation {i} coefficient {k} removed"), &|t| {
                t.equations[i].remove(k);
            });
        }
    }
    out
}

/// Whether the tampered certificate says the same as the genuine one (a change that parses to
/// the same polynomials, such as 2·0 = 0).
fn same_meaning(r: &Ring<PrimeField>, a: &CertificateText, b: &CertificateText) -> bool {
    match (
        FiniteProjection::from_text(r, a),
        FiniteProjection::from_text(r, b),
    ) {
        (Ok(x), Ok(y)) => x.to_text() == y.to_text(),
        _ => false,
    }
}

/// Whether a changed equation still holds (it is a true claim, such as the equation divided by
/// x when its constant term is 0): decided by expanding it in the original variables and a
/// basis of the original ideal, independently of the check.
fn still_true(r: &Ring<PrimeField>, gens: &[P], tampered: &CertificateText, what: &str) -> bool {
    let words: Vec<&str> = what.split(' ').collect();
    let ["equation", i, "coefficient", ..] = words[..] else {
        return false;
    };
    let i: usize = i.parse().unwrap();
    let Ok(nn) = FiniteProjection::from_text(r, tampered) else {
        return false;
    };
    let coefficients = &nn.equations[i];
    if coefficients.first() != Some(&nn.parameter_ring.one()) {
        return false;
    }
    let x = r.var(i);
    let mut p = Poly::zero();
    for c in coefficients {
        let c = nn.parameter_ring.substitute(c, &nn.parameters, r).unwrap();
        p = r.add(&r.mul(&p, &x).unwrap(), &c);
    }
    let gb = groebner_basis(r, gens, Engine::default(), &Control::new()).unwrap();
    gb.contains(&p).unwrap()
}

#[test]
fn every_single_field_tamper_is_rejected() {
    let mut kinds = std::collections::BTreeSet::new();
    let mut rejected = 0;
    for (case, (r, gens)) in systems().into_iter().enumerate() {
        let nn = noether_normalization(&r, &gens, &Options::default(), &Control::new()).unwrap();
        kinds.insert((nn.strategy.name(), nn.rank < nn.module_generators.len()));
        let good = nn.to_text();
        assert!(
            check(&r, &gens, &good).is_empty(),
            "case {case}: {:?}",
            check(&r, &gens, &good)
        );
        for (what, tampered) in tampers(&good) {
            if same_meaning(&r, &good, &tampered) || still_true(&r, &gens, &tampered, &what) {
                continue;
            }
            let problems = check(&r, &gens, &tampered);
            assert!(
                !problems.is_empty(),
                "case {case}: '{what}' accepted: {tampered:?}"
            );
            rejected += 1;
        }
    }
    assert!(rejected > 1000, "{rejected}");
    // Every strategy, and modules with and without torsion, were among the systems.
    let strategies: std::collections::BTreeSet<_> = kinds.iter().map(|k| k.0).collect();
    assert_eq!(strategies.len(), 3, "{kinds:?}");
    assert!(kinds.iter().any(|k| k.1), "{kinds:?}");
}

#[test]
fn huge_degrees_are_rejected_before_any_expansion() {
    let r = ring(65521, &["x", "y", "z"]);
    let gens = polys(&r, &["x*y - z^2", "x^3 - y*z + 1"]);
    let nn = noether_normalization(&r, &gens, &Options::default(), &Control::new()).unwrap();
    let good = nn.to_text();
    assert!(check(&r, &gens, &good).is_empty());
    let last = |t: &CertificateText| t.equations[0].len() - 1;
    for power in ["4294967295", "100000"] {
        let mut t = good.clone();
        let k = last(&t);
        t.equations[0][k] = format!("{} + t1^{power}", t.equations[0][k]);
        let problems = check(&r, &gens, &t);
        assert!(
            problems.iter().any(|p| p.contains("above the bound")),
            "{problems:?}"
        );
    }
    // An equation of degree 200,000: more than the module generators allow.
    let mut t = good.clone();
    t.equations[0] = std::iter::once("1".to_string())
        .chain(std::iter::repeat_n("0".to_string(), 200_000))
        .collect();
    let problems = check(&r, &gens, &t);
    assert!(
        problems.iter().any(|p| p.contains("degree 200000 exceeds")),
        "{problems:?}"
    );
    // A parameter of enormous degree.
    let mut t = good;
    t.parameters[0] = format!("{} + y^4294967295", t.parameters[0]);
    t.coordinates[0] = t.parameters[0].clone();
    let problems = check(&r, &gens, &t);
    assert!(!problems.is_empty());
}

#[test]
fn a_valid_equation_other_than_the_derived_one_is_accepted() {
    // x^2 = 0 in k[x, y]/(x^2, xy) over k[y]: the derived equation is x^2, and x^3 + y·x^2
    // (a multiple) lies in the ideal as well; x^2 + x does not. A module with torsion: the
    // generators 1, x, rank 1.
    let r = ring(32003, &["x", "y"]);
    let gens = polys(&r, &["x^2", "x*y"]);
    let nn = noether_normalization(&r, &gens, &Options::default(), &Control::new()).unwrap();
    assert_eq!((nn.rank, nn.module_generators.len()), (1, 2));
    let mut t = nn.to_text();
    let x = r.var_index("x").unwrap();
    t.equations[x] = vec!["1".into(), "t1".into(), "0".into()];
    assert!(
        check(&r, &gens, &t).is_empty(),
        "{:?}",
        check(&r, &gens, &t)
    );
    t.equations[x] = vec!["1".into(), "1".into(), "0".into()];
    assert!(!check(&r, &gens, &t).is_empty());
}

fn text_entry() -> impl proptest::strategy::Strategy<Value = String> {
    prop_oneof![
        "[-+*^()0-9xyzt_ ]{0,24}",
        "t1\\^[0-9]{1,11}",
        "\\(x \\+ y\\)\\^[0-9]{1,3}",
        Just(String::new()),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    /// Any text in any entry, any integer in the counts: the reader and the check return a
    /// result or an error, never panic.
    #[test]
    fn the_reader_never_crashes(
        field in 0usize..9,
        index in 0usize..4,
        entry in text_entry(),
        number in any::<i64>(),
    ) {
        let r = ring(7, &["x", "y", "z"]);
        let gens = polys(&r, &["x*y - z^2", "x^2 - y"]);
        let nn = noether_normalization(&r, &gens, &Options::default(), &Control::new()).unwrap();
        let mut t = nn.to_text();
        let set = |list: &mut Vec<String>| {
            let k = index.min(list.len());
            if k == list.len() { list.push(entry.clone()) } else { list[k] = entry.clone() }
        };
        match field {
            0 => t.dimension = number,
            1 => t.rank = number,
            2 => t.strategy = entry.clone(),
            3 => set(&mut t.parameters),
            4 => set(&mut t.coordinates),
            5 => set(&mut t.inverse),
            6 => set(&mut t.module_generators),
            7 => set(&mut t.parameter_symbols),
            _ => set(&mut t.equations[index % 3]),
        }
        let _ = check_certificate(&r, &gens, &t, &Control::new());
    }
}
