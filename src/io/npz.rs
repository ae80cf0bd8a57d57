//! A minimal writer for NumPy `.npz` archives: a ZIP file (stored entries, no compression) of `.npy` arrays in
//! format version 1.0 (the NumPy "NEP 1" `.npy` format: magic `\x93NUMPY`, a header dict with `descr`,
//! `fortran_order`, `shape`, padded so the data starts on a 64-byte boundary; little-endian data).
//!
//! Invariant: every array's byte length equals `product(shape) × item size`; entry names end in `.npy`, so
//! `numpy.load(file)[name]` returns the array. Only three dtypes are written: `<i8`, `<f8` and `<U{w}`
//! (UTF-32LE strings, width = the longest string in code points).

/// One array of an `.npz` archive.
#[derive(Clone, Debug, PartialEq)]
pub enum NpyArray {
    /// 64-bit signed integers with a shape (C order).
    I64 { shape: Vec<usize>, data: Vec<i64> },
    /// float64 with a shape (C order).
    F64 { shape: Vec<usize>, data: Vec<f64> },
    /// A 1-D array of Unicode strings.
    Str(Vec<String>),
}

impl NpyArray {
    /// The `.npy` file bytes.
    pub fn to_npy(&self) -> Vec<u8> {
        let (descr, shape, body): (String, Vec<usize>, Vec<u8>) = match self {
            NpyArray::I64 { shape, data } => {
                assert_eq!(shape.iter().product::<usize>(), data.len(), "npy: shape");
                (
                    "<i8".into(),
                    shape.clone(),
                    data.iter().flat_map(|v| v.to_le_bytes()).collect(),
                )
            }
            NpyArray::F64 { shape, data } => {
                assert_eq!(shape.iter().product::<usize>(), data.len(), "npy: shape");
                (
                    "<f8".into(),
                    shape.clone(),
                    data.iter().flat_map(|v| v.to_le_bytes()).collect(),
                )
            }
            NpyArray::Str(items) => {
                let width = items
                    .iter()
                    .map(|s| s.chars().count())
                    .max()
                    .unwrap_or(0)
                    .max(1);
                let mut body = Vec::with_capacity(items.len() * width * 4);
                for s in items {
                    let mut n = 0;
                    for ch in s.chars() {
                        body.extend_from_slice(&(ch as u32).to_le_bytes());
                        n += 1;
                    }
                    body.extend(std::iter::repeat_n(0u8, (width - n) * 4));
                }
                (format!("<U{width}"), vec![items.len()], body)
            }
        };
        let shape_text = match shape.len() {
            1 => format!("({},)", shape[0]),
            _ => format!(
                "({})",
                shape
                    .iter()
                    .map(ToString::to_string)
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        };
        let mut header =
            format!("{{'descr': '{descr}', 'fortran_order': False, 'shape': {shape_text}, }}");
        // magic (6) + version (2) + header length (2) + header + '\n' ≡ 0 (mod 64)
        while (10 + header.len() + 1) % 64 != 0 {
            header.push(' ');
        }
        header.push('\n');
        let mut out = Vec::with_capacity(10 + header.len() + body.len());
        out.extend_from_slice(b"\x93NUMPY\x01\x00");
        out.extend_from_slice(&(header.len() as u16).to_le_bytes());
        out.extend_from_slice(header.as_bytes());
        out.extend_from_slice(&body);
        out
    }
}

/// CRC-32 (IEEE 802.3, reflected polynomial 0xEDB88320), as ZIP requires.
pub fn crc32(bytes: &[u8]) -> u32 {
    let mut crc = 0xFFFF_FFFFu32;
    for &b in bytes {
        crc ^= b as u32;
        for _ in 0..8 {
            crc = if crc & 1 != 0 {
                (crc >> 1) ^ 0xEDB8_8320
            } else {
                crc >> 1
            };
        }
    }
    !crc
}

/// A ZIP archive (PKWARE APPNOTE 6.3: local headers, central directory, end record) of stored entries
/// `NAME.npy`. Precondition: fewer than 65 535 entries and less than 4 GiB in total (no ZIP64).
pub fn npz_bytes(arrays: &[(String, NpyArray)]) -> Vec<u8> {
    let mut out = Vec::new();
    let mut central = Vec::new();
    for (name, arr) in arrays {
        let data = arr.to_npy();
        let fname = format!("{name}.npy");
        let crc = crc32(&data);
        let offset = out.len() as u32;
        let size = data.len() as u32;
        // local file header
        out.extend_from_slice(&0x0403_4b50u32.to_le_bytes());
        out.extend_from_slice(&20u16.to_le_bytes()); // version needed
        out.extend_from_slice(&0u16.to_le_bytes()); // flags
        out.extend_from_slice(&0u16.to_le_bytes()); // method: stored
        out.extend_from_slice(&0u16.to_le_bytes()); // time
        out.extend_from_slice(&0x0021u16.to_le_bytes()); // date 1980-01-01
        out.extend_from_slice(&crc.to_le_bytes());
        out.extend_from_slice(&size.to_le_bytes());
        out.extend_from_slice(&size.to_le_bytes());
        out.extend_from_slice(&(fname.len() as u16).to_le_bytes());
        out.extend_from_slice(&0u16.to_le_bytes());
        out.extend_from_slice(fname.as_bytes());
        out.extend_from_slice(&data);
        // central directory entry
        central.extend_from_slice(&0x0201_4b50u32.to_le_bytes());
        central.extend_from_slice(&20u16.to_le_bytes()); // made by
        central.extend_from_slice(&20u16.to_le_bytes()); // needed
        central.extend_from_slice(&0u16.to_le_bytes());
        central.extend_from_slice(&0u16.to_le_bytes());
        central.extend_from_slice(&0u16.to_le_bytes());
        central.extend_from_slice(&0x0021u16.to_le_bytes());
        central.extend_from_slice(&crc.to_le_bytes());
        central.extend_from_slice(&size.to_le_bytes());
        central.extend_from_slice(&size.to_le_bytes());
        central.extend_from_slice(&(fname.len() as u16).to_le_bytes());
        central.extend_from_slice(&[0u8; 12]); // extra, comment, disk, internal attrs, external attrs (part)
        central.extend_from_slice(&offset.to_le_bytes());
        central.extend_from_slice(fname.as_bytes());
    }
    let cd_offset = out.len() as u32;
    let cd_size = central.len() as u32;
    out.extend_from_slice(&central);
    out.extend_from_slice(&0x0605_4b50u32.to_le_bytes());
    out.extend_from_slice(&[0u8; 4]);
    out.extend_from_slice(&(arrays.len() as u16).to_le_bytes());
    out.extend_from_slice(&(arrays.len() as u16).to_le_bytes());
    out.extend_from_slice(&cd_size.to_le_bytes());
    out.extend_from_slice(&cd_offset.to_le_bytes());
    out.extend_from_slice(&0u16.to_le_bytes());
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn crc32_check_value() {
        // The standard check value of CRC-32/ISO-HDLC for "123456789" (common practice).
        assert_eq!(crc32(b"123456789"), 0xCBF4_3926);
    }

    #[test]
    fn npy_header_is_aligned() {
        let a = NpyArray::F64 {
            shape: vec![2, 3],
            data: vec![0.0; 6],
        };
        let b = a.to_npy();
        assert_eq!(&b[..6], b"\x93NUMPY");
        let hlen = u16::from_le_bytes([b[8], b[9]]) as usize;
        assert_eq!((10 + hlen) % 64, 0);
        assert_eq!(b.len(), 10 + hlen + 48);
        let s = NpyArray::Str(vec!["ab".into(), "-3/7".into()]).to_npy();
        let hlen = u16::from_le_bytes([s[8], s[9]]) as usize;
        assert!(String::from_utf8_lossy(&s[10..10 + hlen]).contains("'<U4'"));
        assert_eq!(s.len(), 10 + hlen + 2 * 4 * 4);
    }
}
