//! A UART that replays a recorded byte stream: what a GNSS receiver would have sent.
//! On a board, use the HAL's UART instead; anything implementing
//! `embedded_hal_nb::serial::Read<u8>` plugs into [`crate::source::MeasurementSource`].

use embedded_hal_nb::serial::{Error, ErrorKind, ErrorType, Read};

/// End of the recorded stream.
#[derive(Debug, Clone, Copy, PartialEq, Eq, defmt::Format)]
pub struct EndOfStream;

impl Error for EndOfStream {
    fn kind(&self) -> ErrorKind {
        ErrorKind::Other
    }
}

/// Replays `bytes` one at a time.
pub struct ReplayUart {
    bytes: &'static [u8],
    at: usize,
}

impl ReplayUart {
    /// A UART that will deliver `bytes`.
    pub const fn new(bytes: &'static [u8]) -> Self {
        ReplayUart { bytes, at: 0 }
    }
}

impl ErrorType for ReplayUart {
    type Error = EndOfStream;
}

impl Read<u8> for ReplayUart {
    fn read(&mut self) -> nb::Result<u8, EndOfStream> {
        let b = self
            .bytes
            .get(self.at)
            .copied()
            .ok_or(nb::Error::Other(EndOfStream))?;
        self.at += 1;
        Ok(b)
    }
}
