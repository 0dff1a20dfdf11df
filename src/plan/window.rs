//! The planning window: the one rule that turns a request and a mission's `window:` block into a
//! start and an end, shared by every command (`passes`, `track`, `plan`, `mask`, `chart`) and by
//! library users.
//!
//! The rule: the start is the request's, else the mission's `window.start`. The end is the
//! request's end, else the request's length in days, else the mission's `window.end`, else the
//! mission's `window.days`, else one day after the start. The window must end after it starts and
//! last at most [`crate::config::limits::WINDOW_DAYS`].

use crate::config::limits::{short_number, RangeError, WINDOW_DAYS};
use crate::config::mission::Mission;
use crate::timefmt::{add_seconds, format_ms, seconds_between};
use chrono::{DateTime, Utc};

/// What a caller asks of the window; every field falls back to the mission file.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct WindowRequest {
    pub start: Option<DateTime<Utc>>,
    pub end: Option<DateTime<Utc>>,
    pub days: Option<f64>,
}

/// A planning window: `start < end`, at most [`WINDOW_DAYS`] long.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Window {
    start: DateTime<Utc>,
    end: DateTime<Utc>,
}

/// Why a window could not be formed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum WindowError {
    #[error("no start time: give a start (--start TIME, RFC 3339 UTC) or window.start in the mission file")]
    NoStart,
    #[error("both an end and a length in days were asked for: give one")]
    EndAndDays,
    #[error("window length: {0}")]
    Days(RangeError),
    #[error("the end of the window ({end}) is not after its start ({start})")]
    EndNotAfterStart { start: String, end: String },
    #[error(
        "the window from {start} to {end} lasts {days} days, longer than the {max} days allowed"
    )]
    TooLong {
        start: String,
        end: String,
        days: String,
        max: f64,
    },
}

impl Window {
    /// A window from `start` to `end`.
    pub fn new(start: DateTime<Utc>, end: DateTime<Utc>) -> Result<Window, WindowError> {
        if end <= start {
            return Err(WindowError::EndNotAfterStart {
                start: format_ms(&start),
                end: format_ms(&end),
            });
        }
        let days = seconds_between(&start, &end) / 86400.0;
        if days > WINDOW_DAYS.max {
            return Err(WindowError::TooLong {
                start: format_ms(&start),
                end: format_ms(&end),
                days: short_number((days * 100.0).round() / 100.0),
                max: WINDOW_DAYS.max,
            });
        }
        Ok(Window { start, end })
    }

    /// A window of `days` days from `start`.
    pub fn from_days(start: DateTime<Utc>, days: f64) -> Result<Window, WindowError> {
        let days = WINDOW_DAYS.check(days).map_err(WindowError::Days)?;
        Window::new(start, add_seconds(&start, days * 86400.0))
    }

    /// Resolve a request against the mission's `window:` block (see the module documentation).
    ///
    /// ```
    /// use passbudget::plan::{Window, WindowRequest};
    /// use passbudget::timefmt::utc;
    ///
    /// let req = WindowRequest { start: Some(utc(2026, 12, 1, 12, 0, 0)), days: Some(7.0), end: None };
    /// let w = Window::resolve(&req, None)?;
    /// assert_eq!(w.end(), utc(2026, 12, 8, 12, 0, 0));
    /// // Without a start (and no mission to take one from) there is no window.
    /// assert!(Window::resolve(&WindowRequest::default(), None).is_err());
    /// # Ok::<(), passbudget::plan::window::WindowError>(())
    /// ```
    pub fn resolve(req: &WindowRequest, mission: Option<&Mission>) -> Result<Window, WindowError> {
        if req.end.is_some() && req.days.is_some() {
            return Err(WindowError::EndAndDays);
        }
        let start = req
            .start
            .or_else(|| mission.and_then(|m| m.start))
            .ok_or(WindowError::NoStart)?;
        if let Some(end) = req.end {
            return Window::new(start, end);
        }
        if let Some(days) = req.days {
            return Window::from_days(start, days);
        }
        match (mission.and_then(|m| m.end), mission.and_then(|m| m.days)) {
            (Some(end), _) => Window::new(start, end),
            (None, Some(days)) => Window::from_days(start, days),
            (None, None) => Window::from_days(start, crate::config::defaults::WINDOW_DAYS.value),
        }
    }

    pub fn start(&self) -> DateTime<Utc> {
        self.start
    }

    pub fn end(&self) -> DateTime<Utc> {
        self.end
    }

    /// Every UTC date the window touches, in order (a window ending at midnight does not touch
    /// the day that midnight begins).
    pub fn utc_dates(&self) -> Vec<chrono::NaiveDate> {
        let last = (self.end() - chrono::Duration::microseconds(1)).date_naive();
        let mut dates = Vec::new();
        let mut d = self.start().date_naive();
        while d <= last {
            dates.push(d);
            match d.succ_opt() {
                Some(next) => d = next,
                None => break,
            }
        }
        dates
    }

    /// Length in days.
    pub fn days(&self) -> f64 {
        seconds_between(&self.start, &self.end) / 86400.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timefmt::utc;

    #[test]
    fn rule_order() {
        let t0 = utc(2026, 12, 1, 13, 0, 0);
        let req = WindowRequest {
            start: Some(t0),
            ..Default::default()
        };
        // No mission: one day.
        let w = Window::resolve(&req, None).unwrap();
        assert_eq!(w.end(), utc(2026, 12, 2, 13, 0, 0));
        let w = Window::resolve(
            &WindowRequest {
                days: Some(2.0),
                ..req
            },
            None,
        )
        .unwrap();
        assert_eq!(w.end(), utc(2026, 12, 3, 13, 0, 0));
        assert_eq!(
            Window::resolve(&WindowRequest::default(), None),
            Err(WindowError::NoStart)
        );
        assert!(matches!(
            Window::resolve(
                &WindowRequest {
                    days: Some(0.0),
                    ..req
                },
                None
            ),
            Err(WindowError::Days(_))
        ));
        assert!(matches!(
            Window::new(t0, utc(2126, 12, 1, 0, 0, 0)),
            Err(WindowError::TooLong { .. })
        ));
        let e = Window::resolve(
            &WindowRequest {
                days: Some(0.0),
                ..req
            },
            None,
        )
        .unwrap_err();
        assert_eq!(
            e.to_string(),
            "window length: 0 is out of range (0.0001 to 3660 days)"
        );
    }
}
