pub mod tolerance;
