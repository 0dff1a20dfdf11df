//! Find the line of a (possibly nested) key in a YAML text, for error messages about values that
//! parsed but failed validation. A plain text scan: good for the block style our files use.

/// 1-based line of `path` (e.g. `["antenna", "efficiency"]`) in `text`, searching each key after the
/// line of its parent and at a deeper indentation. Falls back to the deepest key found.
pub fn key_line(text: &str, path: &[&str]) -> Option<usize> {
    let lines: Vec<&str> = text.lines().collect();
    let mut start = 0usize;
    let mut parent_indent: Option<usize> = None;
    let mut found: Option<usize> = None;
    for key in path {
        let mut hit = None;
        for (i, raw) in lines.iter().enumerate().skip(start) {
            let trimmed = raw.trim_start();
            let indent = raw.len() - trimmed.len();
            if let Some(pi) = parent_indent {
                if i > start && !trimmed.is_empty() && !trimmed.starts_with('#') && indent <= pi {
                    break;
                }
            }
            let body = trimmed.strip_prefix("- ").unwrap_or(trimmed);
            if let Some(rest) = body.strip_prefix(key) {
                if rest.trim_start().starts_with(':') {
                    hit = Some((i, indent));
                    break;
                }
            }
        }
        match hit {
            Some((i, indent)) => {
                found = Some(i + 1);
                start = i;
                parent_indent = Some(indent);
            }
            None => break,
        }
    }
    found
}

/// 1-based line of the `index`-th item (0-based) of the block list under `key_path`.
pub fn list_item_line(text: &str, key_path: &[&str], index: usize) -> Option<usize> {
    let base = key_line(text, key_path)?;
    let lines: Vec<&str> = text.lines().collect();
    // Flow style on the same line: the whole list is on that line.
    if lines[base - 1].contains('[') && lines[base - 1].trim_end().ends_with(']') {
        return Some(base);
    }
    // Items are the `- ` lines at the indentation of the first one: the dashes of lists nested
    // inside an item (a table, blocked periods) are deeper and do not count.
    let mut count = 0usize;
    let mut item_indent: Option<usize> = None;
    for (i, raw) in lines.iter().enumerate().skip(base) {
        let t = raw.trim_start();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let indent = raw.len() - t.len();
        let dash = t.starts_with("- ") || t == "-";
        match item_indent {
            None if dash => item_indent = Some(indent),
            None => break,
            Some(d) if indent < d || (indent == d && !dash) => break,
            Some(d) if indent > d => continue,
            Some(_) => {}
        }
        if count == index {
            return Some(i + 1);
        }
        count += 1;
    }
    Some(base)
}

/// 1-based line of the second `key:` of the block mapping that starts at line `map_line` (1-based;
/// the line of its first key, which is where the YAML reader reports a duplicate field). Keys of the
/// same mapping share its indentation; the scan stops where the mapping ends.
pub fn duplicate_key_line(text: &str, map_line: usize, key: &str) -> Option<usize> {
    let lines: Vec<&str> = text.lines().collect();
    let first = lines.get(map_line.checked_sub(1)?)?;
    let body = first
        .trim_start()
        .strip_prefix("- ")
        .unwrap_or(first.trim_start());
    let indent = first.len() - body.len();
    let mut seen = 0;
    for (i, raw) in lines.iter().enumerate().skip(map_line - 1) {
        let t = raw.trim_start();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let here = raw.len() - t.len();
        if i + 1 > map_line && (here < indent || here == indent && t.starts_with("- ")) {
            break;
        }
        let t = if i + 1 == map_line { body } else { t };
        if here <= indent {
            if let Some(rest) = t.strip_prefix(key) {
                if rest.trim_start().starts_with(':') {
                    seen += 1;
                    if seen == 2 {
                        return Some(i + 1);
                    }
                }
            }
        }
    }
    None
}

/// 1-based line of `key` inside the list item that starts at line `item_line` (1-based, the line
/// of its `- `): the first line of the item whose key is `key`; `None` when no line of the item
/// starts with it (a key inside a flow mapping `- { a: 1, b: 2 }` is not seen).
pub fn item_key_line(text: &str, item_line: usize, key: &str) -> Option<usize> {
    let lines: Vec<&str> = text.lines().collect();
    let first = lines.get(item_line.checked_sub(1)?)?;
    let dash = first.len() - first.trim_start().len();
    for (i, raw) in lines.iter().enumerate().skip(item_line - 1) {
        let t = raw.trim_start();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        let indent = raw.len() - t.len();
        if i + 1 > item_line && indent <= dash {
            break;
        }
        let body = t.strip_prefix("- ").unwrap_or(t);
        if let Some(rest) = body.strip_prefix(key) {
            if rest.trim_start().starts_with(':') {
                return Some(i + 1);
            }
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn list_items_skip_nested_lists() {
        let text =
            "a:\n  - name: x\n    table:\n      - [0, 1]\n      - [1, 2]\n  - name: y\nb:\n  - 1\n";
        assert_eq!(list_item_line(text, &["a"], 0), Some(2));
        assert_eq!(list_item_line(text, &["a"], 1), Some(6));
        assert_eq!(list_item_line(text, &["b"], 0), Some(8));
        let flush = "a:\n- name: x\n  t:\n  - 1\n- name: y\nb: 2\n";
        assert_eq!(list_item_line(flush, &["a"], 1), Some(5));
    }

    #[test]
    fn finds_nested_keys() {
        let t = "name: a\nantenna:\n  diameter_m: 3\n  efficiency: 2\nreceiver:\n  efficiency: 9\n";
        assert_eq!(key_line(t, &["name"]), Some(1));
        assert_eq!(key_line(t, &["antenna", "efficiency"]), Some(4));
        assert_eq!(key_line(t, &["receiver", "efficiency"]), Some(6));
        assert_eq!(key_line(t, &["climate"]), None);
    }

    #[test]
    fn finds_list_items() {
        let t = "horizon_mask:\n  - [0, 3]\n  - [90, 95]\nname: x\n";
        assert_eq!(list_item_line(t, &["horizon_mask"], 1), Some(3));
        let f = "horizon_mask: [[0, 3], [90, 95]]\n";
        assert_eq!(list_item_line(f, &["horizon_mask"], 1), Some(1));
    }

    #[test]
    fn finds_the_second_of_two_equal_keys() {
        let t = "name: a\nantenna:\n  gain: 3\n  sub:\n    gain: 1\n  gain: 4\nname: b\n";
        assert_eq!(duplicate_key_line(t, 3, "gain"), Some(6));
        assert_eq!(duplicate_key_line(t, 1, "name"), Some(7));
        assert_eq!(duplicate_key_line(t, 3, "name"), None);
        let l = "ladder:\n  - rate: 1\n    rate: 2\n  - rate: 3\n";
        assert_eq!(duplicate_key_line(l, 2, "rate"), Some(3));
    }
}
