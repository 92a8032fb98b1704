//! Dehn twists of Σ_g as automorphisms of π₁.
//!
//! π₁(Σ_g) = ⟨a₀, b₀, …, a_{g−1}, b_{g−1} | [a₀, b₀]⋯[a_{g−1}, b_{g−1}] = 1⟩, [x, y] = x y x⁻¹ y⁻¹.
//! Each twist below is an automorphism of the free group on the a_h, b_h that fixes the
//! boundary word Π [a_h, b_h] exactly (so it is a twist of the surface with one boundary
//! component, and descends to π₁(Σ_g)); generators not listed are fixed:
//!
//! - T_{α_h}: b_h ↦ b_h a_h;
//! - T_{β_h}: a_h ↦ a_h b_h⁻¹;
//! - T_{γ_h} (0 ≤ h ≤ g − 2), with c = b_h a_h⁻¹ b_h⁻¹ a_{h+1} (homology class a_{h+1} − a_h):
//!   a_{h+1} ↦ c⁻¹ a_{h+1} c, b_h ↦ c⁻¹ b_h, b_{h+1} ↦ b_{h+1} c.
//!
//! Matching the comb curves of `cyclorb-mcg`: α_h is the meridian a_h of the handlebody in
//! which every a_h bounds a disc (the vacuum's handlebody: T_{α_h} is diagonal in the comb
//! basis), β_h is the longitude b_h, and γ_h is the meridian c whose class is a_{h+1} − a_h
//! (the comb's γ_h, around the punctures of two neighbouring handles). The pairs meeting once
//! are the same as in `cyclorb-mcg`: (α_h, β_h), (β_h, γ_h), (γ_h, β_{h+1}).
//!
//! Two further twists enter the chain relations: about the curve cutting off the handles
//! h₀, …, h₁ − 1 (a separating curve, the boundary of the subsurface those handles fill):
//! x ↦ ∂⁻¹ x ∂ for x = a_h, b_h (h₀ ≤ h < h₁), ∂ = Π_{h₀ ≤ h < h₁} [a_h, b_h] — see
//! [`separating_twist`]. The side of the conjugation is the one the chain relations force:
//! (T_{α_h} T_{β_h})⁶ equals it exactly as an automorphism of the free group.

use cyclorb_mcg::Curve;

use crate::words::{a, b, Automorphism, Word};

/// The automorphism of the twist about a curve of the Humphries/Lickorish sets at genus g,
/// or `None` when the curve does not exist at that genus.
pub fn twist(curve: Curve, genus: usize) -> Option<Automorphism> {
    let id = Automorphism::identity(genus);
    match curve {
        Curve::Alpha(h) if h < genus => Some(id.with_image(b(h), Word::new(&[b(h), a(h)]))),
        Curve::Beta(h) if h < genus => Some(id.with_image(a(h), Word::new(&[a(h), -b(h)]))),
        Curve::Gamma(h) if h + 1 < genus => {
            let c = gamma_word(h);
            let ci = c.inverse();
            Some(
                id.with_image(a(h + 1), Word::product(&[&ci, &Word::new(&[a(h + 1)]), &c]))
                    .with_image(b(h), Word::product(&[&ci, &Word::new(&[b(h)])]))
                    .with_image(b(h + 1), Word::product(&[&Word::new(&[b(h + 1)]), &c])),
            )
        }
        _ => None,
    }
}

/// The word of the curve γ_h: b_h a_h⁻¹ b_h⁻¹ a_{h+1}.
pub fn gamma_word(h: usize) -> Word {
    Word::new(&[b(h), -a(h), -b(h), a(h + 1)])
}

/// The twist about the separating curve around handles `handles` (its boundary word
/// ∂ = Π [a_h, b_h] over them): a_h ↦ ∂⁻¹ a_h ∂ and b_h ↦ ∂⁻¹ b_h ∂ for h in the range,
/// the other generators fixed.
pub fn separating_twist(genus: usize, handles: std::ops::Range<usize>) -> Automorphism {
    let boundary = Word::commutators(handles.clone());
    let generators: Vec<usize> = handles.flat_map(|h| [2 * h, 2 * h + 1]).collect();
    Automorphism::conjugating(genus, &generators, &boundary.inverse())
}
