package org.switchfit.data;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Reader for comma- or tab-separated text tables (UTF-8).
 *
 * <p>Syntax (RFC 4180 quoting with relaxations that are common practice): the first non-comment line is the
 * header; fields are separated by the delimiter; a field may be enclosed in double quotes, inside which the
 * delimiter, newlines and doubled quotes ({@code ""}) stand for themselves; lines whose first non-blank character
 * is {@code #} and blank lines are skipped; LF, CR LF and lone CR all end a line; a leading byte-order mark is
 * dropped. A row shorter than the header is padded with empty fields (several published tables omit trailing
 * empty fields); a row with extra non-empty fields is an error. Columns with an empty header are dropped.
 * Line numbers count physical lines from 1, so they match what an editor shows.
 *
 * <p>Stateless and thread-safe; errors are {@link UserInputException}s with file and line.
 */
public final class DelimitedReader {

    private DelimitedReader() {
    }

    /** Reads a table, choosing tab as delimiter for {@code .tsv}/{@code .tab} files and comma otherwise. */
    public static TextTable read(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        char delimiter = name.endsWith(".tsv") || name.endsWith(".tab") ? '\t' : ',';
        return read(file, delimiter);
    }

    /** Reads a table with an explicit delimiter. */
    public static TextTable read(Path file, char delimiter) {
        String content;
        try {
            byte[] bytes = Files.readAllBytes(file);
            content = StandardCharsets.UTF_8.newDecoder().decode(ByteBuffer.wrap(bytes)).toString();
        } catch (NoSuchFileException e) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()),
                    "file not found; check the path (relative paths are resolved against the problem file's folder)",
                    e);
        } catch (CharacterCodingException e) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()),
                    "file is not valid UTF-8 text; save it as UTF-8 (plain CSV/TSV)", e);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()),
                    "cannot read file (" + e.getMessage() + "); check permissions", e);
        }
        return parse(content, file.toString(), delimiter);
    }

    /**
     * Parses table text.
     *
     * @param content   the whole file content
     * @param source    the file name used in messages
     * @param delimiter {@code ','} or {@code '\t'} (any character other than a quote or line break works)
     */
    public static TextTable parse(String content, String source, char delimiter) {
        if (delimiter == '"' || delimiter == '\n' || delimiter == '\r') {
            throw new IllegalArgumentException("delimiter must not be a quote or line break: " + (int) delimiter);
        }
        String text = content.startsWith("\uFEFF") ? content.substring(1) : content;
        List<String[]> records = new ArrayList<>();
        List<Integer> lines = new ArrayList<>();
        splitRecords(text, source, delimiter, records, lines);
        if (records.isEmpty()) {
            throw Messages.error(SourceLocation.ofFile(source),
                    "the table is empty; the first line must name the columns");
        }
        String[] header = records.get(0);
        List<Integer> kept = new ArrayList<>();
        List<String> names = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < header.length; i++) {
            String name = header[i].strip();
            if (name.isEmpty()) {
                continue;
            }
            if (!seen.add(name)) {
                throw Messages.error(SourceLocation.ofLine(source, lines.get(0)),
                        "column '%s' appears twice in the header; rename or remove one of them", name);
            }
            kept.add(i);
            names.add(name);
        }
        List<String[]> rows = new ArrayList<>();
        List<Integer> rowLines = new ArrayList<>();
        for (int r = 1; r < records.size(); r++) {
            String[] rec = records.get(r);
            for (int i = header.length; i < rec.length; i++) {
                if (!rec[i].isBlank()) {
                    throw Messages.error(SourceLocation.ofLine(source, lines.get(r)),
                            "the row has %d fields but the header names %d columns; remove the extra fields or"
                                    + " quote fields that contain the delimiter", rec.length, header.length);
                }
            }
            String[] out = new String[kept.size()];
            for (int k = 0; k < out.length; k++) {
                int i = kept.get(k);
                out[k] = i < rec.length ? rec[i] : "";
            }
            rows.add(out);
            rowLines.add(lines.get(r));
        }
        return new TextTable(source, names, rowLines, rows);
    }

    private static void splitRecords(String text, String source, char delimiter, List<String[]> records,
            List<Integer> lines) {
        int n = text.length();
        int pos = 0;
        int line = 1;
        while (pos < n) {
            int recordLine = line;
            int lineEnd = lineEnd(text, pos);
            String physical = text.substring(pos, lineEnd);
            if (physical.isBlank() || physical.stripLeading().startsWith("#")) {
                pos = nextLineStart(text, lineEnd);
                line++;
                continue;
            }
            List<String> fields = new ArrayList<>();
            StringBuilder field = new StringBuilder();
            boolean quoted = false;
            boolean wasQuoted = false;
            while (true) {
                if (pos >= n) {
                    if (quoted) {
                        throw Messages.error(SourceLocation.ofLine(source, recordLine),
                                "a quoted field is not closed before the end of the file; add the closing \"");
                    }
                    break;
                }
                char c = text.charAt(pos);
                if (quoted) {
                    if (c == '"') {
                        if (pos + 1 < n && text.charAt(pos + 1) == '"') {
                            field.append('"');
                            pos += 2;
                        } else {
                            quoted = false;
                            pos++;
                        }
                    } else {
                        if (c == '\n' || (c == '\r' && (pos + 1 >= n || text.charAt(pos + 1) != '\n'))) {
                            line++;
                        }
                        field.append(c);
                        pos++;
                    }
                    continue;
                }
                if (c == '\n' || c == '\r') {
                    break;
                }
                if (c == delimiter) {
                    fields.add(field.toString());
                    field.setLength(0);
                    wasQuoted = false;
                    pos++;
                } else if (c == '"' && field.toString().isBlank() && !wasQuoted) {
                    field.setLength(0);
                    quoted = true;
                    wasQuoted = true;
                    pos++;
                } else if (wasQuoted && !Character.isWhitespace(c)) {
                    throw Messages.error(SourceLocation.ofLine(source, line),
                            "text after the closing quote of field %d; quote the whole field and write inner"
                                    + " quotes as \"\"", fields.size() + 1);
                } else {
                    if (!wasQuoted) {
                        field.append(c);
                    }
                    pos++;
                }
            }
            fields.add(field.toString());
            records.add(fields.toArray(new String[0]));
            lines.add(recordLine);
            pos = nextLineStart(text, pos);
            line++;
        }
    }

    private static int lineEnd(String text, int from) {
        int i = from;
        while (i < text.length() && text.charAt(i) != '\n' && text.charAt(i) != '\r') {
            i++;
        }
        return i;
    }

    private static int nextLineStart(String text, int lineEnd) {
        if (lineEnd >= text.length()) {
            return text.length();
        }
        if (text.charAt(lineEnd) == '\r' && lineEnd + 1 < text.length() && text.charAt(lineEnd + 1) == '\n') {
            return lineEnd + 2;
        }
        return lineEnd + 1;
    }
}
