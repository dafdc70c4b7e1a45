//! The ASTM G173-03 reference spectra in a compact form for the download: the published
//! table's decimal numbers, each stored as an integer mantissa m and a power of ten k (the
//! number is m x 10^k exactly as printed), mantissas as zig-zag variable-length differences
//! along the column and exponents as bytes. Decoding writes `m e k` and reads it with Rust's
//! correctly rounded float parser, so every value is bit for bit the one the CSV text gives
//! (a test checks this against `astm_g173_03.csv`, which stays the reference).
//!
//! Layout: the 4 bytes `G173`, the row count (u16, little-endian), then for each of the four
//! columns (wavelength [nm], extraterrestrial, global tilt, direct + circumsolar
//! [W m^-2 nm^-1]) the row count's mantissa differences, then the row count's exponents.

/// The packed table (made from the CSV by `pack`, see the test that rewrites it).
pub const G173_PACKED: &[u8] = include_bytes!("astm_g173_03.bin");

/// One published decimal: (mantissa, power of ten).
type Decimal = (i64, i8);

fn zigzag(n: i64) -> u64 {
    ((n << 1) ^ (n >> 63)) as u64
}

fn unzigzag(z: u64) -> i64 {
    ((z >> 1) as i64) ^ -((z & 1) as i64)
}

/// The four columns of the packed table as the decimals printed in the CSV, or None if the
/// bytes are not a packed table.
pub fn unpack(bytes: &[u8]) -> Option<[Vec<f64>; 4]> {
    let rest = bytes.strip_prefix(b"G173")?;
    let n = u16::from_le_bytes([*rest.first()?, *rest.get(1)?]) as usize;
    let mut at = 2;
    let mut cols: [Vec<f64>; 4] = Default::default();
    for col in cols.iter_mut() {
        let mut mantissas = Vec::with_capacity(n);
        let mut prev = 0i64;
        for _ in 0..n {
            let (mut z, mut shift) = (0u64, 0u32);
            loop {
                let b = *rest.get(at)?;
                at += 1;
                z |= u64::from(b & 0x7f) << shift;
                if b < 0x80 {
                    break;
                }
                shift += 7;
                if shift > 63 {
                    return None;
                }
            }
            prev += unzigzag(z);
            mantissas.push(prev);
        }
        for m in mantissas {
            let k = *rest.get(at)? as i8;
            at += 1;
            col.push(format!("{m}e{k}").parse().ok()?);
        }
    }
    Some(cols)
}

/// The decimal printed as `text` (e.g. "280.5", "4.7309E-23") as (mantissa, power of ten).
pub fn decimal(text: &str) -> Option<Decimal> {
    let t = text.trim();
    let (m, e) = match t.find(['e', 'E']) {
        Some(i) => (&t[..i], t[i + 1..].parse::<i32>().ok()?),
        None => (t, 0),
    };
    let (int, frac) = m.split_once('.').unwrap_or((m, ""));
    let digits = format!("{int}{frac}");
    let k = e - frac.len() as i32;
    Some((digits.parse().ok()?, i8::try_from(k).ok()?))
}

/// Pack four columns of decimals (as `unpack` reads them).
pub fn pack(cols: &[Vec<Decimal>; 4]) -> Vec<u8> {
    let n = cols[0].len();
    let mut out = b"G173".to_vec();
    out.extend_from_slice(&(n as u16).to_le_bytes());
    for col in cols {
        let mut prev = 0i64;
        for &(m, _) in col {
            let mut z = zigzag(m - prev);
            prev = m;
            loop {
                let b = (z & 0x7f) as u8;
                z >>= 7;
                out.push(if z != 0 { b | 0x80 } else { b });
                if z == 0 {
                    break;
                }
            }
        }
        out.extend(col.iter().map(|&(_, k)| k as u8));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    const CSV: &str = include_str!("astm_g173_03.csv");

    fn csv_decimals() -> [Vec<Decimal>; 4] {
        let mut cols: [Vec<Decimal>; 4] = Default::default();
        for line in CSV.lines().skip(2) {
            let cells: Vec<&str> = line.split(',').collect();
            for (c, col) in cols.iter_mut().enumerate() {
                col.push(decimal(cells[c]).expect("a decimal"));
            }
        }
        cols
    }

    #[test]
    fn the_packed_table_is_the_published_one_bit_for_bit() {
        // the reference: ASTM G173-03 as shipped in the CSV (2002 rows, 280-4000 nm)
        let packed = pack(&csv_decimals());
        if std::env::var_os("GLOWGAP_WRITE_G173").is_some() {
            std::fs::write(concat!(env!("CARGO_MANIFEST_DIR"), "/src/physics/data/astm_g173_03.bin"), &packed).unwrap();
        }
        assert_eq!(packed, G173_PACKED, "astm_g173_03.bin is stale: run with GLOWGAP_WRITE_G173=1 to rewrite it");
        let cols = unpack(G173_PACKED).unwrap();
        assert_eq!(cols[0].len(), 2002);
        for (r, line) in CSV.lines().skip(2).enumerate() {
            for (c, cell) in line.split(',').enumerate().take(4) {
                let want: f64 = cell.trim().parse().unwrap();
                assert_eq!(cols[c][r].to_bits(), want.to_bits(), "row {r}, column {c}: {cell}");
            }
        }
    }

    #[test]
    fn decimals_and_damaged_bytes() {
        assert_eq!(decimal("280.5"), Some((2805, -1)));
        assert_eq!(decimal("4.7309E-23"), Some((47309, -27)));
        assert_eq!(decimal("0.082"), Some((82, -3)));
        assert_eq!(unpack(b"nope"), None);
        assert_eq!(unpack(&G173_PACKED[..G173_PACKED.len() - 1]), None);
    }
}
