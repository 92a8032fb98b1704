//! The claims of a re-check, in the order they were checked, stopping at the first failure.

use serde::{Deserialize, Serialize};

/// One claim: its name, whether it held, and how it was re-derived (or why it failed).
#[derive(Clone, Debug, Serialize, Deserialize, PartialEq, Eq)]
pub struct Claim {
    /// Short name, e.g. `charpoly`.
    pub name: String,
    /// Whether it held.
    pub ok: bool,
    /// How it was re-derived, or the reason it failed.
    pub detail: String,
}

/// The reason a certificate made over Q(ζ_stated) does not fit generators over Q(ζ_own).
pub fn same_conductor(stated: u32, own: u32) -> Result<(), String> {
    if stated == own {
        Ok(())
    } else {
        Err(format!("conductor {stated} but the field is Q(ζ_{own})"))
    }
}

/// Why a re-check stopped early.
pub enum Stop {
    /// A claim failed (it is the last one recorded).
    Failed,
    /// The file or its input is invalid: the message names the file, place and reason.
    Invalid(String),
}

/// The claims checked so far.
#[derive(Default)]
pub struct Claims {
    list: Vec<Claim>,
}

impl Claims {
    /// Check one claim: `check` returns the detail of a claim that holds or the reason it
    /// fails; a failure stops the re-check.
    pub fn claim(
        &mut self,
        name: &str,
        check: impl FnOnce() -> Result<String, String>,
    ) -> Result<(), Stop> {
        let (ok, detail) = match check() {
            Ok(d) => (true, d),
            Err(d) => (false, d),
        };
        self.list.push(Claim {
            name: name.to_string(),
            ok,
            detail,
        });
        if ok {
            Ok(())
        } else {
            Err(Stop::Failed)
        }
    }

    /// The claims checked, in order.
    pub fn into_list(self) -> Vec<Claim> {
        self.list
    }
}
