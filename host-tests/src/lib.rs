//! Host harness.
