//! When a design was saved, in the browser's time zone (`YYYY-MM-DD HH:MM`).

fn tz_offset_min() -> f64 {
    js_sys::Date::new_0().get_timezone_offset()
}

/// `format_when` in the browser's time zone.
pub fn local_when(ms: f64) -> String {
    format_when(ms, tz_offset_min())
}

/// `YYYY-MM-DD HH:MM` for a time in ms since the epoch, shifted by
/// `tz_offset_min` (JavaScript's `getTimezoneOffset`: minutes *behind* UTC).
pub fn format_when(ms: f64, tz_offset_min: f64) -> String {
    if !ms.is_finite() || ms <= 0.0 {
        return "—".into();
    }
    let local_min = (ms / 60_000.0).floor() as i64 - tz_offset_min.round() as i64;
    let days = local_min.div_euclid(1440);
    let mins = local_min.rem_euclid(1440);
    // Civil date from days since 1970-01-01 (proleptic Gregorian).
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02} {:02}:{:02}", mins / 60, mins % 60)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_format_in_local_time() {
        // 2026-12-02T04:08:52Z
        let ms = 1_796_184_532_000.0;
        assert_eq!(format_when(ms, 0.0), "2026-12-02 04:08");
        // UTC+2 has getTimezoneOffset -120.
        assert_eq!(format_when(ms, -120.0), "2026-12-02 06:08");
        assert_eq!(format_when(ms, 300.0), "2026-12-01 23:08");
        assert_eq!(format_when(0.0, 0.0), "—");
        assert_eq!(format_when(951_782_400_000.0, 0.0), "2000-02-29 00:00");
    }
}
