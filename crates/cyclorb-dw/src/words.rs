//! Words in the free group on a₀, b₀, …, a_{g−1}, b_{g−1} and automorphisms given by the
//! images of the generators.
//!
//! A letter is a non-zero integer: +(k + 1) for generator k and −(k + 1) for its inverse,
//! with a_h = generator 2h and b_h = generator 2h + 1. Words are kept freely reduced, so two
//! words are equal in the free group exactly when they are equal as lists. Automorphisms
//! compose as maps: (σ ∘ ρ)(x) = σ(ρ(x)), the images of ρ with σ substituted.

/// A freely reduced word.
#[derive(Clone, Debug, PartialEq, Eq, Hash, Default)]
pub struct Word(Vec<i32>);

/// The letter of a_h.
pub fn a(h: usize) -> i32 {
    2 * h as i32 + 1
}

/// The letter of b_h.
pub fn b(h: usize) -> i32 {
    2 * h as i32 + 2
}

impl Word {
    /// The reduced form of a list of letters (0 is not a letter and is dropped).
    pub fn new(letters: &[i32]) -> Word {
        let mut out: Vec<i32> = Vec::with_capacity(letters.len());
        for &x in letters {
            if x == 0 {
                continue;
            }
            if out.last() == Some(&-x) {
                out.pop();
            } else {
                out.push(x);
            }
        }
        Word(out)
    }

    /// The empty word.
    pub fn identity() -> Word {
        Word(Vec::new())
    }

    /// The letters, reduced.
    pub fn letters(&self) -> &[i32] {
        &self.0
    }

    /// self · other, reduced.
    pub fn mul(&self, other: &Word) -> Word {
        let mut v = self.0.clone();
        v.extend_from_slice(&other.0);
        Word::new(&v)
    }

    /// The inverse word.
    pub fn inverse(&self) -> Word {
        Word(self.0.iter().rev().map(|x| -x).collect())
    }

    /// The product of several words.
    pub fn product(parts: &[&Word]) -> Word {
        let v: Vec<i32> = parts.iter().flat_map(|w| w.0.iter().copied()).collect();
        Word::new(&v)
    }

    /// The boundary word Π_h [a_h, b_h] = a₀ b₀ a₀⁻¹ b₀⁻¹ ⋯ of the genus-g surface group,
    /// [x, y] = x y x⁻¹ y⁻¹.
    pub fn boundary(genus: usize) -> Word {
        Word::new(&commutator_letters(0..genus))
    }

    /// Π_{h ∈ handles} [a_h, b_h].
    pub fn commutators(handles: std::ops::Range<usize>) -> Word {
        Word::new(&commutator_letters(handles))
    }
}

fn commutator_letters(handles: std::ops::Range<usize>) -> Vec<i32> {
    handles.flat_map(|h| [a(h), b(h), -a(h), -b(h)]).collect()
}

/// An endomorphism of the free group of rank 2g, by the images of its generators.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Automorphism {
    images: Vec<Word>,
}

impl Automorphism {
    /// The identity of the free group on 2g generators.
    pub fn identity(genus: usize) -> Automorphism {
        Automorphism {
            images: (0..2 * genus as i32).map(|k| Word(vec![k + 1])).collect(),
        }
    }

    /// The identity with the image of one letter's generator replaced (`letter` > 0).
    pub fn with_image(mut self, letter: i32, image: Word) -> Automorphism {
        self.images[letter as usize - 1] = image;
        self
    }

    /// The image of generator k (0-based).
    pub fn image(&self, k: usize) -> &Word {
        &self.images[k]
    }

    /// Every generator's image, a₀, b₀, a₁, … in order.
    pub fn images(&self) -> &[Word] {
        &self.images
    }

    /// The image of a word.
    pub fn apply(&self, w: &Word) -> Word {
        let mut v = Vec::new();
        for &x in w.letters() {
            let image = &self.images[x.unsigned_abs() as usize - 1];
            if x > 0 {
                v.extend_from_slice(image.letters());
            } else {
                v.extend(image.letters().iter().rev().map(|y| -y));
            }
        }
        Word::new(&v)
    }

    /// self ∘ other: `other` first, then `self`.
    pub fn compose(&self, other: &Automorphism) -> Automorphism {
        Automorphism {
            images: other.images.iter().map(|w| self.apply(w)).collect(),
        }
    }

    /// Conjugation of the generators `generators` (0-based) by w: x ↦ w x w⁻¹; the others
    /// are fixed.
    pub fn conjugating(genus: usize, generators: &[usize], w: &Word) -> Automorphism {
        let mut out = Automorphism::identity(genus);
        for &k in generators {
            out.images[k] = Word::product(&[w, &Word(vec![k as i32 + 1]), &w.inverse()]);
        }
        out
    }
}
