//! # cyclorb-cert: certificates for generator sets over Q(ζ_n)

#![deny(missing_docs)]
