//! Bad input never panics: arbitrary text into the polynomial and model parsers, arbitrary numbers into the
//! configuration constructor (property tests; a panic fails the test).

use proptest::prelude::*;
use sheafwright::geometry::Configuration;
use sheafwright::io::model::Model;
use sheafwright::poly::{Polynomial, VariableLayout};

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn polynomial_parser_never_panics(text in "[x0-9_^*+\\-/ ]{0,40}") {
        let layout = VariableLayout::new(&[1, 2]);
        if let Ok(p) = Polynomial::parse(&text, &layout) {
            let _ = p.check_equation(&layout, &[1, 1]);
            // Whatever parses, prints back to an equal polynomial.
            prop_assert_eq!(Polynomial::parse(&p.to_text(&layout), &layout).unwrap(), p);
        }
    }

    #[test]
    fn model_parser_never_panics(text in "[\\[\\]a-z0-9_=,\"\\n .-]{0,80}") {
        let _ = Model::from_toml_str(&text, "fuzz");
    }

    #[test]
    fn configuration_constructor_never_panics(
        dims in prop::collection::vec(prop_oneof![any::<i64>(), -3i64..6], 0..5),
        eqs in prop::collection::vec(prop::collection::vec(prop_oneof![any::<i64>(), -2i64..7], 0..5), 0..4),
    ) {
        let _ = Configuration::new(&dims, &eqs);
    }

    #[test]
    fn structured_models_load_or_explain(
        dims in prop::collection::vec(-1i64..4, 1..4),
        degs in prop::collection::vec(prop::collection::vec(-1i64..5, 1..4), 1..3),
        bundles in prop::collection::vec(prop::collection::vec(-3i64..4, 1..4), 0..7),
    ) {
        let mut text = format!("[ambient]\ndims = {dims:?}\n");
        for d in &degs { text.push_str(&format!("[[equations]]\nmultidegree = {d:?}\n")); }
        if !bundles.is_empty() { text.push_str(&format!("[bundle]\nline_bundles = {bundles:?}\n")); }
        match Model::from_toml_str(&text, "fuzz") {
            Ok(m) => prop_assert!(m.config().dimension() >= 1),
            Err(e) => prop_assert!(!e.to_string().is_empty()),
        }
    }
}
