//! Ray letters: the name each guide ray goes by on the sheet, the key, the
//! class summary and in the answer file, given once when the plan is made.

/// Letters for guide rays, top to bottom. I is left out: on a sheet it reads
/// as 1 or l. Past the tenth ray the letters start again at A.
pub const RAY_LETTERS: &[u8] = b"ABCDEFGHJK";

/// Positions of `heights` from the highest to the lowest; equal heights keep
/// their given order.
pub fn top_down(heights: &[f64]) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..heights.len()).collect();
    idx.sort_by(|&a, &b| heights[b].total_cmp(&heights[a]));
    idx
}

/// The letter of every guide height, in the order of `heights`: A for the
/// highest (furthest above the axis), B for the next, and so on down.
pub fn ray_letters(heights: &[f64]) -> Vec<String> {
    let mut letters = vec![String::new(); heights.len()];
    for (k, i) in top_down(heights).into_iter().enumerate() {
        letters[i] = char::from(RAY_LETTERS[k % RAY_LETTERS.len()]).to_string();
    }
    letters
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn letters_run_from_the_top_and_skip_i() {
        assert_eq!(ray_letters(&[-4.0, 12.0, 4.0]), ["C", "A", "B"]);
        let many: Vec<f64> = (0..11).map(|k| -f64::from(k)).collect();
        let letters = ray_letters(&many);
        assert_eq!(letters.concat(), "ABCDEFGHJKA");
    }

    #[test]
    fn equal_heights_keep_their_order() {
        assert_eq!(ray_letters(&[0.0, 5.0, 0.0]), ["B", "A", "C"]);
        assert!(ray_letters(&[]).is_empty());
    }
}
