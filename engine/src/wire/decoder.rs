//! The frame decoder: bytes in, messages or named errors out, in `B` bytes of memory.

use super::{payload, Message, WireError, CRC, OVERHEAD, SYNC, VERSION};

/// What the decoder has seen.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DecoderStats {
    /// Frames decoded.
    pub frames: u32,
    /// Bytes skipped while looking for a frame start.
    pub skipped_bytes: u32,
    /// Frames dropped (bad CRC, oversize, bad version or payload).
    pub dropped: u32,
}

/// Frame decoder with a `B`-byte buffer (at least [`super::buffer_for`] of the epoch size
/// used). Feed bytes with [`FrameDecoder::feed`], then drain with [`FrameDecoder::poll`]
/// until it returns `None`.
#[derive(Clone, Debug)]
pub struct FrameDecoder<const B: usize> {
    buf: [u8; B],
    len: usize,
    stats: DecoderStats,
}

impl<const B: usize> Default for FrameDecoder<B> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const B: usize> FrameDecoder<B> {
    /// An empty decoder.
    pub const fn new() -> Self {
        const { assert!(B > OVERHEAD, "the buffer must hold a frame header and CRC") };
        FrameDecoder {
            buf: [0; B],
            len: 0,
            stats: DecoderStats {
                frames: 0,
                skipped_bytes: 0,
                dropped: 0,
            },
        }
    }

    /// Counters.
    pub fn stats(&self) -> DecoderStats {
        self.stats
    }

    /// Appends a byte.
    ///
    /// # Errors
    /// The byte is handed back when the buffer is full; call [`FrameDecoder::poll`] first
    /// (it always frees space when the buffer is full).
    pub fn feed(&mut self, byte: u8) -> Result<(), u8> {
        match self.buf.get_mut(self.len) {
            Some(slot) => {
                *slot = byte;
                self.len = self.len.saturating_add(1);
                Ok(())
            }
            None => Err(byte),
        }
    }

    /// Drops the first `n` buffered bytes.
    fn consume(&mut self, n: usize) {
        // Both bounds clamped so the range is provably inside the array: no panic path.
        let len = self.len.min(B);
        let n = n.min(len);
        // A byte loop rather than `copy_within`: the general memmove it calls costs 1.5 KB of
        // flash on the target, and a frame is consumed once.
        for i in 0..len.saturating_sub(n) {
            let v = self.buf.get(i.saturating_add(n)).copied().unwrap_or(0);
            if let Some(d) = self.buf.get_mut(i) {
                *d = v;
            }
        }
        self.len = len.saturating_sub(n);
    }

    /// Drops one byte of a bad frame start so the search resumes after it.
    fn drop_frame(&mut self, e: WireError) -> WireError {
        self.consume(1);
        self.stats.dropped = self.stats.dropped.saturating_add(1);
        e
    }

    /// The next complete message or error in the buffer; `None` when more bytes are needed.
    pub fn poll<const N: usize>(&mut self) -> Option<Result<Message<N>, WireError>> {
        // Skip to a sync pair (a lone first sync byte at the end may start one).
        let start = self
            .buf
            .get(..self.len)?
            .windows(2)
            .position(|w| w == SYNC)
            .unwrap_or_else(|| {
                let last_is_sync0 =
                    self.len > 0 && self.buf.get(self.len.saturating_sub(1)) == Some(&SYNC[0]);
                self.len.saturating_sub(usize::from(last_is_sync0))
            });
        if start > 0 {
            self.stats.skipped_bytes = self.stats.skipped_bytes.saturating_add(start as u32);
            self.consume(start);
        }
        let head = self.buf.get(..6.min(self.len))?;
        let &[_, _, version, kind, l0, l1] = head else {
            return None;
        };
        if version != VERSION {
            return Some(Err(self.drop_frame(WireError::UnsupportedVersion(version))));
        }
        let declared = u16::from_le_bytes([l0, l1]);
        let total = usize::from(declared).saturating_add(OVERHEAD);
        if total > B {
            return Some(Err(self.drop_frame(WireError::Oversize { declared })));
        }
        if self.len < total {
            return None;
        }
        let body_end = total.saturating_sub(4);
        let crc_ok = match (self.buf.get(2..body_end), self.buf.get(body_end..total)) {
            (Some(body), Some(&[c0, c1, c2, c3])) => {
                CRC.checksum(body) == u32::from_le_bytes([c0, c1, c2, c3])
            }
            _ => false,
        };
        if !crc_ok {
            return Some(Err(self.drop_frame(WireError::BadCrc)));
        }
        let result = self
            .buf
            .get(6..body_end)
            .ok_or(WireError::PayloadLength)
            .and_then(|p| payload::decode::<N>(kind, p));
        // A frame with a good CRC is consumed whole, even if its payload is refused.
        self.consume(total);
        match &result {
            Ok(_) => self.stats.frames = self.stats.frames.saturating_add(1),
            Err(_) => self.stats.dropped = self.stats.dropped.saturating_add(1),
        }
        Some(result)
    }
}
