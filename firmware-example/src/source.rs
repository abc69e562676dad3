//! The measurement source: bytes from a UART, decoded into engine messages.

use embedded_hal_nb::serial::Read;
use trackfix_engine::wire::{DecoderStats, FrameDecoder, Message, WireError};

/// Why no message came.
#[derive(Debug, Clone, Copy, PartialEq, defmt::Format)]
pub enum SourceError<E> {
    /// The UART failed (or, when replaying, the stream ended).
    Uart(E),
    /// A frame was dropped; the decoder has resynchronised.
    Frame(WireError),
}

/// Frames of up to `B` bytes carrying epochs of up to `N` observations.
pub struct MeasurementSource<R, const N: usize, const B: usize> {
    uart: R,
    decoder: FrameDecoder<B>,
}

impl<R: Read<u8>, const N: usize, const B: usize> MeasurementSource<R, N, B> {
    /// A source reading `uart`.
    pub const fn new(uart: R) -> Self {
        MeasurementSource {
            uart,
            decoder: FrameDecoder::new(),
        }
    }

    /// Decoder counters.
    pub fn stats(&self) -> DecoderStats {
        self.decoder.stats()
    }

    /// The next message: `WouldBlock` while bytes are still arriving.
    pub fn poll(&mut self) -> nb::Result<Message<N>, SourceError<R::Error>> {
        loop {
            if let Some(m) = self.decoder.poll::<N>() {
                return m.map_err(|e| nb::Error::Other(SourceError::Frame(e)));
            }
            let byte = self.uart.read().map_err(|e| e.map(SourceError::Uart))?;
            if let Err(b) = self.decoder.feed(byte) {
                // Full: poll always frees space when the buffer is full.
                let r = self.decoder.poll::<N>();
                let _ = self.decoder.feed(b);
                if let Some(m) = r {
                    return m.map_err(|e| nb::Error::Other(SourceError::Frame(e)));
                }
            }
        }
    }
}
