//! Where planned passes go: the [`PassSink`] trait and two simple sinks.

use super::results::PassSeries;

/// Receives each pass with its time series as soon as it is planned (from worker threads, in no
/// particular order), as a search library hands its matches to a sink.
pub trait PassSink: Sync {
    type Error: std::error::Error + Send + Sync + 'static;
    /// One planned pass.
    fn pass(&self, series: &PassSeries<'_>) -> Result<(), Self::Error>;
    /// Called once per planned pass with the number of passes to plan.
    fn progress(&self, _total: usize) {}
}

/// The sink that keeps nothing: use it to collect the plan's results only.
pub struct Collect;

impl PassSink for Collect {
    type Error = std::convert::Infallible;
    fn pass(&self, _: &PassSeries<'_>) -> Result<(), Self::Error> {
        Ok(())
    }
}

/// A closure as a sink.
pub struct FnSink<F>(pub F);

impl<F, E> PassSink for FnSink<F>
where
    F: Fn(&PassSeries<'_>) -> Result<(), E> + Sync,
    E: std::error::Error + Send + Sync + 'static,
{
    type Error = E;
    fn pass(&self, series: &PassSeries<'_>) -> Result<(), E> {
        (self.0)(series)
    }
}
