//! Reading a pasted or dropped table: delimiter, header row, quoted fields, BOM, CRLF,
//! decimal commas, blank and NA cells. Built on the `csv` crate.

use serde::{Deserialize, Serialize};

use crate::base::format::brief;
use crate::base::{Error, ErrorKind, Note};

/// The kind of values a column holds.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum ColumnKind {
    /// Every filled cell is a number.
    Number,
    /// Mostly numbers, but some cells are not (probably typing errors).
    NumberWithText,
    /// Text labels.
    Label,
    /// No filled cell at all.
    Empty,
}

/// One cell as typed, with the line of the pasted text it came from (1-based).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cell<'a> {
    pub text: &'a str,
    pub line: u64,
}

/// A column: its cells' text end to end, where each ends, and the line of each row (shared
/// by the table's columns, 32 bits each), about 4 bytes per cell beyond its text.
#[derive(Clone, Debug)]
pub struct Column {
    pub name: String,
    pub kind: ColumnKind,
    text: String,
    ends: Vec<u32>,
    lines: std::sync::Arc<Vec<u32>>,
}

impl Column {
    /// The number of cells (the table's rows).
    pub fn len(&self) -> usize {
        self.ends.len()
    }

    /// Whether the column has no cells.
    pub fn is_empty(&self) -> bool {
        self.ends.is_empty()
    }

    /// The cell in row `i` (0-based).
    pub fn cell(&self, i: usize) -> Cell<'_> {
        let start = if i == 0 { 0 } else { self.ends[i - 1] as usize };
        Cell {
            text: &self.text[start..self.ends[i] as usize],
            line: u64::from(self.lines[i]),
        }
    }

    /// Every cell, in row order.
    pub fn cells(&self) -> impl ExactSizeIterator<Item = Cell<'_>> + '_ {
        (0..self.len()).map(|i| self.cell(i))
    }
}

/// The most text a table may hold (offsets are kept in 32 bits): 4 GiB.
const MAX_TABLE_TEXT: u64 = u32::MAX as u64;

fn too_large() -> Error {
    Error::new(
        ErrorKind::Table,
        "The table holds more than 4 GiB of text, more than can be analysed at once. Keep \
         only the columns the analysis needs, or split the table.",
    )
}

/// A parsed table.
#[derive(Clone, Debug)]
pub struct Table {
    pub columns: Vec<Column>,
    pub rows: usize,
    pub delimiter: u8,
    pub header: bool,
    /// Whether decimal commas may be read as decimal points (delimiter is not a comma).
    pub decimal_comma: bool,
    /// Lines of the comment block ('#' first) before the table, skipped.
    pub comment_lines: usize,
}

impl Table {
    /// What reading the table noticed, for the report (the comment block skipped).
    pub fn notes(&self) -> Vec<Note> {
        if self.comment_lines > 0 {
            vec![Note::CommentLinesSkipped {
                count: self.comment_lines,
            }]
        } else {
            Vec::new()
        }
    }
}

/// How the user wants the first row treated.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum HeaderChoice {
    #[default]
    Detect,
    Names,
    Data,
}

/// A cell's value: a number, missing (blank or an NA marker), or text that is not a number.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    Number(f64),
    Missing,
    Text,
}

/// The largest magnitude a value may have: squares and sums of squares of values up to
/// 1e150 stay far from the largest double (about 1.8e308).
pub const MAX_MAGNITUDE: f64 = 1e150;

/// Markers read as missing values, compared case-insensitively, besides blank cells.
pub const MISSING_MARKERS: [&str; 4] = ["na", "n/a", "nan", "."];

/// The error values spreadsheets write into cells (Excel, LibreOffice, Google Sheets),
/// compared case-insensitively.
pub const SPREADSHEET_ERRORS: [&str; 12] = [
    "#N/A",
    "#N/A!",
    "#DIV/0!",
    "#VALUE!",
    "#REF!",
    "#NAME?",
    "#NUM!",
    "#NULL!",
    "#SPILL!",
    "#CALC!",
    "#GETTING_DATA",
    "#ERROR!",
];

/// Whether a cell holds a spreadsheet's error value (such as #N/A or #DIV/0!).
pub fn is_spreadsheet_error(text: &str) -> bool {
    let t = text.trim();
    t.starts_with('#') && SPREADSHEET_ERRORS.iter().any(|m| t.eq_ignore_ascii_case(m))
}

/// Reads one cell as a number. With `decimal_comma`, "4,25" reads as 4.25. Blank cells, NA
/// markers and spreadsheet error values are missing.
pub fn read_value(text: &str, decimal_comma: bool) -> Value {
    let t = text.trim();
    if t.is_empty()
        || MISSING_MARKERS.iter().any(|m| t.eq_ignore_ascii_case(m))
        || is_spreadsheet_error(t)
    {
        return Value::Missing;
    }
    let plain = |s: &str| -> Option<f64> {
        // Only plain decimal notation (with optional exponent); no "inf", "nan", hex.
        let ok = s
            .bytes()
            .all(|c| c.is_ascii_digit() || matches!(c, b'.' | b'-' | b'+' | b'e' | b'E'));
        if !ok || !s.bytes().any(|c| c.is_ascii_digit()) {
            return None;
        }
        s.parse::<f64>().ok().filter(|v| v.is_finite())
    };
    if let Some(v) = plain(t) {
        return Value::Number(v);
    }
    if decimal_comma && t.matches(',').count() == 1 && !t.contains('.') {
        if let Some(v) = plain(&t.replace(',', ".")) {
            return Value::Number(v);
        }
    }
    Value::Text
}

/// Words read as a yes (1) and a no (0) outcome, compared case-insensitively.
pub const YES_WORDS: [&str; 6] = ["1", "yes", "y", "true", "pass", "success"];
pub const NO_WORDS: [&str; 6] = ["0", "no", "n", "false", "fail", "failure"];

/// Reads one cell as a yes/no outcome: Some(Some(true)) for a yes, Some(Some(false)) for a
/// no, Some(None) for a blank or NA cell, None for anything else.
pub fn read_yes_no(text: &str) -> Option<Option<bool>> {
    let t = text.trim();
    if t.is_empty()
        || MISSING_MARKERS.iter().any(|m| t.eq_ignore_ascii_case(m))
        || is_spreadsheet_error(t)
    {
        return Some(None);
    }
    if YES_WORDS.iter().any(|w| t.eq_ignore_ascii_case(w)) || t == "1.0" {
        Some(Some(true))
    } else if NO_WORDS.iter().any(|w| t.eq_ignore_ascii_case(w)) || t == "0.0" {
        Some(Some(false))
    } else {
        None
    }
}

/// Whether every filled cell of a column reads as yes/no (and at least one is filled).
pub fn is_yes_no(col: &Column) -> bool {
    let mut any = false;
    for c in col.cells() {
        match read_yes_no(c.text) {
            None => return false,
            Some(Some(_)) => any = true,
            Some(None) => {}
        }
    }
    any
}

/// How many lines of the comment block before the table start with '#' (blank lines
/// between them included), and the byte where the table starts. Only this leading block is
/// skipped: a '#' further down is data (a label such as "#1", or a spreadsheet error cell).
fn comment_block(text: &str) -> (usize, usize) {
    let (mut comments, mut at) = (0, 0);
    for line in text.split_inclusive('\n') {
        let t = line.trim();
        if t.starts_with('#')
            && !is_spreadsheet_error(t.split([',', ';', '\t']).next().unwrap_or(""))
        {
            comments += 1;
        } else if !t.is_empty() {
            break;
        }
        at += line.len();
    }
    (comments, at)
}

/// Reads a table's records one at a time: each with the line it starts on, blank lines
/// skipped, the comment block before the table passed over (its lines still counted).
struct RecordReader<'a> {
    text: &'a str,
    /// Lines of the comment block before `text`.
    skipped_lines: u64,
    reader: csv::Reader<&'a [u8]>,
    cursor: (usize, u64),
}

impl<'a> RecordReader<'a> {
    fn new(text: &'a str, delimiter: u8) -> RecordReader<'a> {
        let start = comment_block(text).1;
        let skipped_lines = text[..start].matches('\n').count() as u64;
        let text = &text[start..];
        let reader = csv::ReaderBuilder::new()
            .delimiter(delimiter)
            .has_headers(false)
            .flexible(true)
            .trim(csv::Trim::All)
            .from_reader(text.as_bytes());
        RecordReader {
            text,
            skipped_lines,
            reader,
            cursor: (0, 0),
        }
    }

    /// The next record that is not blank, into `rec`, and its line; None at the end.
    fn next(&mut self, rec: &mut csv::StringRecord) -> Result<Option<u64>, Error> {
        loop {
            let more = self.reader.read_record(rec).map_err(|e| {
                let line = e.position().map_or(0, |p| {
                    line_of(self.text, p.byte() as usize, &mut self.cursor) + self.skipped_lines
                });
                Error::new(
                    ErrorKind::Table,
                    format!(
                        "Line {line} could not be read as a table row ({e}). Check for a stray quote mark."
                    ),
                )
                .at_line(line)
            })?;
            if !more {
                return Ok(None);
            }
            let line = rec.position().map_or(0, |p| {
                line_of(self.text, p.byte() as usize, &mut self.cursor) + self.skipped_lines
            });
            if !rec.iter().all(|c| c.is_empty()) {
                return Ok(Some(line));
            }
        }
    }
}

/// The 1-based line on which the record starting at byte `at` has its first character
/// (the reader's own line count is unreliable around blank lines).
/// `cursor` holds (byte, newlines before it) of the previous call, so that a whole table is
/// numbered in one pass.
fn line_of(text: &str, at: usize, cursor: &mut (usize, u64)) -> u64 {
    let bytes = text.as_bytes();
    let mut b = at.min(bytes.len());
    while b < bytes.len() && (bytes[b] == b'\n' || bytes[b] == b'\r') {
        b += 1;
    }
    if b < cursor.0 {
        *cursor = (0, 0);
    }
    cursor.1 += bytes[cursor.0..b].iter().filter(|&&c| c == b'\n').count() as u64;
    cursor.0 = b;
    1 + cursor.1
}

/// Picks the delimiter: tab, then semicolon, then comma, whichever splits the first rows
/// into a consistent number of fields (more than one).
fn detect_delimiter(text: &str) -> u8 {
    let sample: String = text[comment_block(text).1..]
        .lines()
        .filter(|l| !l.trim().is_empty())
        .take(30)
        .collect::<Vec<_>>()
        .join("\n");
    for d in [b'\t', b';', b','] {
        let mut reader = RecordReader::new(&sample, d);
        let mut rec = csv::StringRecord::new();
        let mut lens = Vec::new();
        while let Ok(Some(_)) = reader.next(&mut rec) {
            lens.push(rec.len());
        }
        if lens
            .first()
            .is_some_and(|&first| first > 1 && lens.iter().all(|&l| l == first))
        {
            return d;
        }
    }
    // Ragged or single-column: take the first delimiter that appears at all.
    for d in [b'\t', b';', b','] {
        if sample.as_bytes().contains(&d) {
            return d;
        }
    }
    b','
}

pub fn delimiter_name(d: u8) -> &'static str {
    match d {
        b'\t' => "tab",
        b';' => "semicolon",
        _ => "comma",
    }
}

/// The table's body as it is read: each column's cell text end to end with where each cell
/// ends, and each row's line. A row longer than the rows before it adds columns, empty above.
#[derive(Default)]
struct Body {
    columns: Vec<(String, Vec<u32>)>,
    lines: Vec<u32>,
}

impl Body {
    fn add_columns(&mut self, width: usize) {
        let rows = self.lines.len();
        while self.columns.len() < width {
            let mut ends = Vec::with_capacity(self.lines.capacity());
            ends.resize(rows, 0);
            self.columns.push((String::new(), ends));
        }
    }

    fn push<'f>(&mut self, line: u64, fields: impl Iterator<Item = &'f str>) -> Result<(), Error> {
        let mut n = 0;
        for (i, f) in fields.enumerate() {
            if i >= self.columns.len() {
                self.add_columns(i + 1);
            }
            let (text, ends) = &mut self.columns[i];
            if text.len() as u64 + f.len() as u64 > MAX_TABLE_TEXT {
                return Err(too_large());
            }
            text.push_str(f);
            ends.push(text.len() as u32);
            n = i + 1;
        }
        for (text, ends) in &mut self.columns[n..] {
            ends.push(text.len() as u32);
        }
        // A line number beyond 32 bits means more than 4 GiB of text.
        self.lines
            .push(u32::try_from(line).map_err(|_| too_large())?);
        Ok(())
    }
}

thread_local! {
    /// Whether [`parse`] keeps the last table it read, and the table: (fingerprint and length
    /// of the text, header choice, table).
    static KEEP_LAST: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
    static LAST: std::cell::RefCell<Option<(u64, usize, HeaderChoice, Table)>> =
        const { std::cell::RefCell::new(None) };
}

/// Makes [`parse`] keep the last table it read and hand out a copy when asked for the same
/// text again (a worker that runs one job several times, in a run shared among workers);
/// off: forgets it.
pub fn keep_last_table(on: bool) {
    KEEP_LAST.with(|k| k.set(on));
    if !on {
        LAST.with(|l| *l.borrow_mut() = None);
    }
}

/// Parses pasted or dropped text into a table.
pub fn parse(text: &str, header: HeaderChoice) -> Result<Table, Error> {
    if !KEEP_LAST.with(|k| k.get()) {
        return parse_text(text, header);
    }
    let print = crate::input::text::fingerprint(text);
    let kept = LAST.with(|l| {
        l.borrow().as_ref().and_then(|(p, len, h, t)| {
            (*p == print && *len == text.len() && *h == header).then(|| t.clone())
        })
    });
    if let Some(t) = kept {
        return Ok(t);
    }
    let table = parse_text(text, header)?;
    LAST.with(|l| *l.borrow_mut() = Some((print, text.len(), header, table.clone())));
    Ok(table)
}

fn parse_text(text: &str, header: HeaderChoice) -> Result<Table, Error> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    if text.trim().is_empty() {
        return Err(Error::new(
            ErrorKind::Table,
            "The data box is empty. Paste a table (for example from a spreadsheet), drop a file, or pick an example.",
        ));
    }
    let delimiter = detect_delimiter(text);
    let decimal_comma = delimiter != b',';
    let is_num = |s: &str| matches!(read_value(s, decimal_comma), Value::Number(_));
    let mut reader = RecordReader::new(text, delimiter);
    let mut rec = csv::StringRecord::new();
    // The first record waits until the second shows whether it names the columns.
    let Some(first_line) = reader.next(&mut rec)? else {
        return Err(Error::new(
            ErrorKind::Table,
            "No rows were found in the data.",
        ));
    };
    let first: Vec<String> = rec.iter().map(str::to_string).collect();
    let second = reader.next(&mut rec)?;
    let has_header = match header {
        HeaderChoice::Names => true,
        HeaderChoice::Data => false,
        HeaderChoice::Detect => second.is_some() && !first.iter().any(|c| is_num(c)),
    };
    // Room for every row at once (one per line at most), so that no column grows by copying.
    let mut body = Body {
        columns: Vec::new(),
        lines: Vec::with_capacity(text.bytes().filter(|&b| b == b'\n').count() + 1),
    };
    if has_header {
        body.add_columns(first.len());
    } else {
        body.push(first_line, first.iter().map(String::as_str))?;
    }
    let mut next = second;
    while let Some(line) = next {
        if has_header {
            let filled = rec
                .iter()
                .enumerate()
                .filter(|(_, c)| !c.is_empty())
                .last()
                .map_or(0, |(i, _)| i + 1);
            if filled > first.len() {
                return Err(Error::new(
                    ErrorKind::Table,
                    format!(
                        "Line {line} has {filled} fields but the first row names only {} \
                         columns. Remove the extra fields or add a name for each column.",
                        first.len()
                    ),
                )
                .at_line(line));
            }
            body.push(line, rec.iter().take(first.len()))?;
        } else {
            body.push(line, rec.iter())?;
        }
        next = reader.next(&mut rec)?;
    }
    let width = body.columns.len();
    let mut names: Vec<String> = Vec::with_capacity(width);
    for i in 0..width {
        let raw = if has_header {
            first.get(i).cloned().unwrap_or_default()
        } else {
            String::new()
        };
        let base = if raw.is_empty() {
            format!("Column {}", i + 1)
        } else {
            raw
        };
        let mut name = base.clone();
        let mut k = 2;
        while names.contains(&name) {
            name = format!("{base} ({k})");
            k += 1;
        }
        names.push(name);
    }
    let rows = body.lines.len();
    // Shared by the columns without a copy.
    let lines = std::sync::Arc::new(body.lines);
    let mut columns: Vec<Column> = names
        .into_iter()
        .zip(body.columns)
        .map(|(name, (text, ends))| Column {
            name,
            kind: ColumnKind::Empty,
            text,
            ends,
            lines: lines.clone(),
        })
        .collect();
    for col in &mut columns {
        col.text.shrink_to_fit();
        let (mut num, mut text) = (0usize, 0usize);
        for c in col.cells() {
            match read_value(c.text, decimal_comma) {
                Value::Number(_) => num += 1,
                Value::Text => text += 1,
                Value::Missing => {}
            }
        }
        col.kind = if num == 0 && text == 0 {
            ColumnKind::Empty
        } else if text == 0 {
            ColumnKind::Number
        } else if num >= text * 2 {
            ColumnKind::NumberWithText
        } else {
            ColumnKind::Label
        };
    }
    Ok(Table {
        rows,
        columns,
        delimiter,
        header: has_header,
        decimal_comma,
        comment_lines: comment_block(text).0,
    })
}

impl Table {
    pub fn column(&self, name: &str) -> Result<&Column, Error> {
        self.columns.iter().find(|c| c.name == name).ok_or_else(|| {
            // A first row of numbers (years, say) is read as data; if the name asked for is
            // one of its cells, say how to make that row the header.
            let in_first_row = !self.header
                && self
                    .columns
                    .iter()
                    .any(|c| !c.is_empty() && c.cell(0).text.trim() == name.trim());
            if in_first_row {
                return Error::new(
                    ErrorKind::Column,
                    format!(
                        "\"{name}\" is in the first row, which holds only numbers and so was read \
                         as data. If the first row names the columns, say so: set \"First row\" \
                         to \"holds column names\" (in the command: --header names)."
                    ),
                )
                .at_line(self.columns[0].cell(0).line);
            }
            let names: Vec<String> = self
                .columns
                .iter()
                .map(|c| format!("\"{}\"", c.name))
                .collect();
            Error::new(
                ErrorKind::Column,
                format!(
                    "There is no column named \"{name}\". The columns are: {}.",
                    names.join(", ")
                ),
            )
        })
    }
}

/// Numbers of a column, read strictly: each cell is a number or missing.
#[derive(Debug)]
pub struct NumericColumn {
    /// (row index in the table, value) for every filled cell.
    pub values: Vec<(usize, f64)>,
    /// Cells left out: blank, NA markers and spreadsheet error values.
    pub missing: usize,
    pub decimal_commas: usize,
    /// How many of the missing cells hold a spreadsheet error value, with the line and text
    /// of the first few.
    pub spreadsheet_errors: usize,
    pub spreadsheet_error_cells: Vec<(u64, String)>,
    /// How many values have more significant digits than a double keeps (17), and the
    /// line and text of the first.
    pub too_precise: usize,
    pub too_precise_first: Option<(u64, String)>,
}

/// Significant digits of a number as typed: from the first non-zero digit to the last
/// non-zero one of the mantissa ("0.00120" has 2, "1234567890.12345678901" has 21).
pub fn significant_digits(text: &str) -> usize {
    let mantissa = text.trim().split(['e', 'E']).next().unwrap_or("");
    let digits: Vec<u8> = mantissa.bytes().filter(u8::is_ascii_digit).collect();
    let first = digits.iter().position(|&d| d != b'0');
    let last = digits.iter().rposition(|&d| d != b'0');
    match (first, last) {
        (Some(f), Some(l)) => l - f + 1,
        _ => 0,
    }
}

/// Notes on the cells of column `name` left out as missing: blank or NA cells, and
/// spreadsheet error values with the lines of the first few.
pub fn left_out_notes(name: &str, missing: &[Cell]) -> Vec<Note> {
    let errors: Vec<&Cell> = missing
        .iter()
        .filter(|c| is_spreadsheet_error(c.text))
        .collect();
    let mut notes = Vec::new();
    if missing.len() > errors.len() {
        notes.push(Note::MissingCells {
            column: name.to_string(),
            count: missing.len() - errors.len(),
        });
    }
    if !errors.is_empty() {
        notes.push(Note::SpreadsheetErrors {
            column: name.to_string(),
            count: errors.len(),
            cells: errors
                .iter()
                .take(5)
                .map(|c| (c.line, c.text.trim().to_string()))
                .collect(),
        });
    }
    notes
}

impl NumericColumn {
    /// Notes on the cells of column `name` left out: blank or NA cells, and spreadsheet
    /// error values (with their lines).
    pub fn push_notes(&self, name: &str, notes: &mut Vec<Note>) {
        let blank = self.missing - self.spreadsheet_errors;
        if blank > 0 {
            notes.push(Note::MissingCells {
                column: name.to_string(),
                count: blank,
            });
        }
        notes.extend(self.spreadsheet_note(name));
        notes.extend(self.precision_note(name));
    }

    /// The note on values with more digits than a double keeps, if there are any.
    pub fn precision_note(&self, name: &str) -> Option<Note> {
        let (line, text) = self.too_precise_first.clone()?;
        Some(Note::DigitsBeyondDouble {
            column: name.to_string(),
            count: self.too_precise,
            line,
            text,
        })
    }

    /// The note on spreadsheet error values in column `name`, if it has any.
    pub fn spreadsheet_note(&self, name: &str) -> Option<Note> {
        (self.spreadsheet_errors > 0).then(|| Note::SpreadsheetErrors {
            column: name.to_string(),
            count: self.spreadsheet_errors,
            cells: self.spreadsheet_error_cells.clone(),
        })
    }
}

impl Column {
    /// Reads every cell as a number; a cell holding text is an error that names it.
    pub fn numbers(&self, decimal_comma: bool) -> Result<NumericColumn, Error> {
        let mut values = Vec::with_capacity(self.len());
        let mut nums = self.numbers_each(decimal_comma, &mut |i, v| values.push((i, v)))?;
        nums.values = values;
        Ok(nums)
    }

    /// [`Column::numbers`] handing each (row, value) to `each` instead of keeping them (the
    /// result's `values` is empty), for callers that sort the values as they come.
    pub fn numbers_each(
        &self,
        decimal_comma: bool,
        each: &mut dyn FnMut(usize, f64),
    ) -> Result<NumericColumn, Error> {
        let mut missing = 0;
        let mut decimal_commas = 0;
        let (mut spreadsheet_errors, mut spreadsheet_error_cells) = (0, Vec::new());
        let (mut too_precise, mut too_precise_first) = (0, None);
        let mut bad: Vec<Cell> = Vec::new();
        for (i, c) in self.cells().enumerate() {
            match read_value(c.text, decimal_comma) {
                Value::Number(v) => {
                    if v.abs() > MAX_MAGNITUDE {
                        return Err(Error::new(
                            ErrorKind::Value,
                            format!(
                                "Line {} of column \"{}\" holds {}, beyond the ±1e150 this \
                                 analysis computes with safely (sums of squares would \
                                 overflow). Rescale the column (for example, divide every \
                                 value by a power of ten) and run again.",
                                c.line,
                                self.name,
                                crate::base::format::brief(c.text.trim())
                            ),
                        )
                        .at_line(c.line)
                        .in_column(self.name.clone()));
                    }
                    if c.text.contains(',') {
                        decimal_commas += 1;
                    }
                    if significant_digits(c.text) > 17 {
                        too_precise += 1;
                        if too_precise_first.is_none() {
                            too_precise_first = Some((c.line, brief(c.text.trim())));
                        }
                    }
                    each(i, v)
                }
                Value::Missing => {
                    missing += 1;
                    if is_spreadsheet_error(c.text) {
                        spreadsheet_errors += 1;
                        if spreadsheet_error_cells.len() < 5 {
                            spreadsheet_error_cells.push((c.line, c.text.trim().to_string()));
                        }
                    }
                }
                Value::Text => bad.push(c),
            }
        }
        if let Some(first) = bad.first() {
            let more = if bad.len() > 1 {
                let lines: Vec<String> = bad
                    .iter()
                    .skip(1)
                    .take(4)
                    .map(|c| c.line.to_string())
                    .collect();
                format!(
                    " {} more cell{} in this column {} not numbers (line{} {}{}).",
                    bad.len() - 1,
                    if bad.len() > 2 { "s" } else { "" },
                    if bad.len() > 2 { "are" } else { "is" },
                    if bad.len() > 2 { "s" } else { "" },
                    lines.join(", "),
                    if bad.len() > 5 { ", …" } else { "" }
                )
            } else {
                String::new()
            };
            return Err(Error::new(
                ErrorKind::Value,
                format!(
                    "Line {} of column \"{}\" holds \"{}\", which is not a number. Correct it, or \
                     clear the cell to leave it out.{more}",
                    first.line,
                    self.name,
                    crate::base::format::brief(first.text)
                ),
            )
            .at_line(first.line)
            .in_column(self.name.clone()));
        }
        Ok(NumericColumn {
            values: Vec::new(),
            missing,
            decimal_commas,
            spreadsheet_errors,
            spreadsheet_error_cells,
            too_precise,
            too_precise_first,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Class: a '#' is data. Only the comment block before the header is skipped (and
    /// counted); labels such as "#1" and lines that start with a spreadsheet error are rows.
    #[test]
    fn a_hash_is_data_except_in_the_comment_block_before_the_table() {
        let text =
            "# made up for a test\n#   second comment line\n\nweight,batch\n4.1,#1\n3.9,#1\n\
                    #N/A,#2\n4.4,#2\n#DIV/0!,#2\n";
        let t = parse(text, HeaderChoice::Detect).unwrap();
        assert_eq!(t.comment_lines, 2);
        assert_eq!(t.notes(), vec![Note::CommentLinesSkipped { count: 2 }]);
        assert_eq!(t.rows, 5, "every row after the header is data");
        let batch = t.column("batch").unwrap();
        assert_eq!(batch.cell(0).text, "#1");
        assert_eq!(batch.kind, ColumnKind::Label);
        // Spreadsheet errors in a numeric column: missing, with their lines.
        let nums = t
            .column("weight")
            .unwrap()
            .numbers(t.decimal_comma)
            .unwrap();
        assert_eq!(nums.values.len(), 3);
        assert_eq!(nums.missing, 2);
        let mut notes = Vec::new();
        nums.push_notes("weight", &mut notes);
        assert_eq!(
            notes,
            vec![Note::SpreadsheetErrors {
                column: "weight".into(),
                count: 2,
                cells: vec![(7, "#N/A".into()), (9, "#DIV/0!".into())],
            }]
        );
        // A '#' comment after the header is not skipped: it is a row (here a bad one).
        let e = parse("y,g\n1,a\n# not a comment\n2,b\n", HeaderChoice::Detect)
            .unwrap()
            .column("y")
            .unwrap()
            .numbers(false)
            .unwrap_err();
        assert_eq!(e.line, Some(3), "{e:?}");
    }

    /// Class: a first row of numbers (years as column names) read as data: asking for one of
    /// its cells as a column says how to make it the header, and doing so works.
    #[test]
    fn a_first_row_of_numbers_used_as_names_says_how_to_make_it_the_header() {
        let text = "2019,2020\n4.1,4.4\n3.9,4.8\n4.0,4.6\n";
        let t = parse(text, HeaderChoice::Detect).unwrap();
        let e = t.column("2019").unwrap_err();
        assert!(e.message.contains("--header names"), "{}", e.message);
        assert!(e.message.contains("holds column names"), "{}", e.message);
        assert_eq!(e.line, Some(1));
        let t = parse(text, HeaderChoice::Names).unwrap();
        assert_eq!(t.column("2019").unwrap().len(), 3);
    }

    /// Class: more significant digits than a double keeps get a note (17 digits suffice to
    /// tell doubles apart; IEEE 754).
    #[test]
    fn digits_beyond_a_double_get_a_note() {
        assert_eq!(significant_digits("0.00120"), 2);
        assert_eq!(significant_digits("-1234567890.12345678901e3"), 21);
        let t = parse("y,g\n1234567890.123456789,a\n2.5,b\n", HeaderChoice::Detect).unwrap();
        let n = t.column("y").unwrap().numbers(false).unwrap();
        let mut notes = Vec::new();
        n.push_notes("y", &mut notes);
        assert!(
            matches!(
                &notes[..],
                [Note::DigitsBeyondDouble {
                    count: 1,
                    line: 2,
                    ..
                }]
            ),
            "{notes:?}"
        );
    }

    /// Class: a huge cell (after an unterminated quote, say) is quoted only briefly.
    #[test]
    fn a_huge_cell_is_quoted_briefly() {
        let text = format!("y,g\n1,a\n\"{},b\n", "x".repeat(1_000_000));
        let t = parse(&text, HeaderChoice::Detect).unwrap();
        let e = t.column("y").unwrap().numbers(false).unwrap_err();
        assert!(e.message.len() < 400, "{} characters", e.message.len());
        assert!(e.message.contains("characters)"), "{}", e.message);
    }

    #[test]
    fn reads_tab_separated_with_header() {
        let t = parse(
            "yield\tschedule\n4.1\tdrip\n3.9\tsprinkler\n",
            HeaderChoice::Detect,
        )
        .unwrap();
        assert_eq!(t.delimiter, b'\t');
        assert!(t.header);
        assert_eq!(t.columns[0].name, "yield");
        assert_eq!(t.columns[0].kind, ColumnKind::Number);
        assert_eq!(t.columns[1].kind, ColumnKind::Label);
        assert_eq!(t.rows, 2);
    }

    #[test]
    fn bom_crlf_quotes_and_comments() {
        let text = "\u{feff}# invented example\r\n\"time, s\",desk\r\n12.5,\"North, upper\"\r\n13,South\r\n";
        let t = parse(text, HeaderChoice::Detect).unwrap();
        assert_eq!(t.columns[0].name, "time, s");
        assert_eq!(t.columns[1].cell(0).text, "North, upper");
        assert_eq!(t.columns[1].cell(1).line, 4);
    }

    #[test]
    fn decimal_commas_with_semicolons() {
        let t = parse("a;b\n1,5;2,25\n3;4\n", HeaderChoice::Detect).unwrap();
        assert_eq!(t.delimiter, b';');
        let a = t.columns[0].numbers(t.decimal_comma).unwrap();
        assert_eq!(a.values, vec![(0, 1.5), (1, 3.0)]);
        assert_eq!(a.decimal_commas, 1);
    }

    #[test]
    fn no_header_when_first_row_is_numeric() {
        let t = parse("1,2\n3,4\n", HeaderChoice::Detect).unwrap();
        assert!(!t.header);
        assert_eq!(t.columns[1].name, "Column 2");
        assert_eq!(t.rows, 2);
    }

    #[test]
    fn text_in_numeric_column_names_line_and_text() {
        let t = parse("x,g\n1,a\n2,a\n3,b\n4.l,b\n5,b\n", HeaderChoice::Detect).unwrap();
        assert_eq!(t.columns[0].kind, ColumnKind::NumberWithText);
        let err = t.columns[0].numbers(t.decimal_comma).err().unwrap();
        assert!(err.message.contains("Line 5"), "{err}");
        assert!(err.message.contains("\"4.l\""), "{err}");
        assert!(err.message.contains("\"x\""), "{err}");
    }

    #[test]
    fn blanks_and_na_are_missing() {
        let t = parse("x,y\n1,\n,2\nNA,3\n4,n/a\n", HeaderChoice::Detect).unwrap();
        let x = t.columns[0].numbers(false).unwrap();
        assert_eq!(x.missing, 2);
        assert_eq!(x.values.len(), 2);
    }

    #[test]
    fn too_many_fields_is_an_error() {
        let err = parse("a,b\n1,2\n3,4,5\n", HeaderChoice::Detect)
            .err()
            .unwrap();
        assert!(err.message.contains("Line 3"), "{err}");
    }

    #[test]
    fn infinities_are_not_numbers() {
        assert_eq!(read_value("inf", false), Value::Text);
        assert_eq!(read_value("-1e3", false), Value::Number(-1000.0));
        assert_eq!(read_value(" NA ", false), Value::Missing);
    }

    #[test]
    fn empty_text_is_a_clear_error() {
        assert!(parse("  \n", HeaderChoice::Detect)
            .err()
            .unwrap()
            .message
            .contains("empty"));
    }
}
