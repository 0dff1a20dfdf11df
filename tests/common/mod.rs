#![allow(dead_code)]
pub mod tolerance;
