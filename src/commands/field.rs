//! `cyclorb field`: evaluate expressions exactly in Q(ζ_n) and print their canonical form,
//! minimal root-of-unity order (when one) and a display-only complex value.

use cyclorb_field::CyclotomicField;
use serde_json::json;

use super::output::{Outcome, Report};
use crate::cli::FieldArgs;

/// Run `cyclorb field`.
pub fn run(args: &FieldArgs, as_json: bool) -> Outcome {
    let field = match CyclotomicField::new(args.conductor) {
        Ok(f) => f,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    let mut items = Vec::new();
    let mut text = String::new();
    for expr in &args.expressions {
        let value = match field.parse(expr) {
            Ok(v) => v,
            Err(e) => return Outcome::Invalid(format!("expression {expr:?}: {e}")),
        };
        let order = match field.root_of_unity_order(&value) {
            Ok(o) => o,
            Err(e) => return Outcome::Invalid(e.to_string()),
        };
        let (re, im) = value.to_complex();
        text.push_str(&format!("{expr} = {value}    ≈ {re:.6} {im:+.6}i"));
        if let Some(o) = order {
            text.push_str(&format!("    (root of unity of order {o})"));
        }
        text.push('\n');
        items.push(json!({
            "expression": expr,
            "value": value.to_string(),
            "root_of_unity_order": order,
            "approx": [re, im],
        }));
    }
    let json = json!({ "conductor": field.conductor(), "values": items });
    Outcome::Done(Report::new(json, text, as_json))
}
