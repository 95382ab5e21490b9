//! Directed hybrids of the localized picture (DESIGN §4.4). `coulson` holds the geometric
//! model; the maximum-overlap and localized-orbital models and the localized ladder build
//! on the extended Hückel matrices.

pub mod coulson;
