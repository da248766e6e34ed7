package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/**
 * The CSV/TSV reader: quoting as in RFC 4180 (Shafranovich 2005, section 2), comments, line numbers, special
 * numbers and error messages; and a seeded write-then-read round trip with {@link DelimitedWriter}.
 */
class DelimitedReaderTest {

    @TempDir
    Path dir;

    private static TextTable csv(String text) {
        return DelimitedReader.parse(text, "t.csv", ',');
    }

    private static void assertMessage(UserInputException e, String... parts) {
        for (String part : parts) {
            assertTrue(e.getMessage().contains(part), "expected '" + part + "' in: " + e.getMessage());
        }
    }

    @Test
    void quotedFieldsFollowRfc4180() {
        // RFC 4180 section 2, rules 5-7: quoted fields may contain commas, line breaks and doubled quotes.
        TextTable t = csv("a,b,c\n\"x,y\",\"say \"\"hi\"\"\",\"two\nlines\"\nplain,,\"\"\n");
        assertEquals(List.of("a", "b", "c"), t.columns());
        assertEquals(2, t.rows().size());
        TextTable.Row r = t.rows().get(0);
        assertEquals("x,y", r.text("a"));
        assertEquals("say \"hi\"", r.text("b"));
        assertEquals("two\nlines", r.text("c"));
        assertEquals(2, r.line());
        assertEquals(4, t.rows().get(1).line(), "the quoted line break counts as a physical line");
        assertEquals("", t.rows().get(1).text("b"));
        assertEquals("", t.rows().get(1).text("c"));
    }

    @Test
    void commentsBlankLinesBomAndLineEndings() {
        TextTable t = csv("\uFEFF# header comment\r\nx,y\r\n\r\n  # indented comment\r1,2\r\n3,4");
        assertEquals(List.of("x", "y"), t.columns(), "byte-order mark dropped");
        assertEquals(2, t.rows().size());
        assertEquals(5, t.rows().get(0).line(), "CR LF, blank, lone CR counted as line ends");
        assertEquals(6, t.rows().get(1).line());
        assertEquals(4.0, t.rows().get(1).number("y"), 0.0);
        TextTable tsv = DelimitedReader.parse("a\tb\n1\t2\n", "t.tsv", '\t');
        assertEquals(2.0, tsv.rows().get(0).number("b"), 0.0);
    }

    @Test
    void shortRowsArePaddedAndEmptyHeaderColumnsDropped() {
        TextTable t = csv(",a,b,c\n0,1\n9,1,2,3\n");
        assertEquals(List.of("a", "b", "c"), t.columns());
        assertEquals("1", t.rows().get(0).text("a"));
        assertEquals("", t.rows().get(0).text("c"));
        assertEquals(3.0, t.rows().get(1).number("c"), 0.0);
    }

    @Test
    void specialNumbers() {
        TextTable t = csv("v\nnan\nNaN\ninf\n-Inf\n+infinity\n-1.5e-3\n.5\n");
        double[] expected = {Double.NaN, Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
            Double.POSITIVE_INFINITY, -1.5e-3, 0.5};
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], t.rows().get(i).number("v"), 0.0, "row " + i);
        }
        for (String bad : List.of("0x10", "1d", "2f", "1,5", "e5", "1e", "--1", "")) {
            assertThrows(NumberFormatException.class, () -> DataNumbers.parse(bad), bad);
        }
    }

    @Test
    void errors() {
        UserInputException e = assertThrows(UserInputException.class,
                () -> csv("a,b\n1,2\n3,x\n").rows().get(1).number("b"));
        assertMessage(e, "t.csv, line 3, column 2", "column 'b': 'x' is not a number", "write a decimal number");
        e = assertThrows(UserInputException.class, () -> csv("a,b\n1,2,3\n"));
        assertMessage(e, "t.csv, line 2", "3 fields but the header names 2 columns", "quote fields");
        e = assertThrows(UserInputException.class, () -> csv("a,b\n\"1,2\n"));
        assertMessage(e, "t.csv, line 2", "not closed", "add the closing");
        e = assertThrows(UserInputException.class, () -> csv("a,a\n1,2\n"));
        assertMessage(e, "t.csv, line 1", "column 'a' appears twice", "rename or remove");
        e = assertThrows(UserInputException.class, () -> csv("a,b\n\"1\"x,2\n"));
        assertMessage(e, "line 2", "text after the closing quote", "quote the whole field");
        e = assertThrows(UserInputException.class, () -> csv("# only a comment\n"));
        assertMessage(e, "t.csv", "the table is empty", "first line must name the columns");
        e = assertThrows(UserInputException.class, () -> csv("a,b\n,2\n").rows().get(0).requireText("a"));
        assertMessage(e, "line 2, column 1", "column 'a' is empty", "give a value");
        TextTable t = csv("time,value\n");
        e = assertThrows(UserInputException.class, () -> t.requireColumns("measurement table", "tiem", "valu"));
        assertMessage(e, "t.csv, line 1", "no column 'tiem' (did you mean 'time'?)", "add the column");
        e = assertThrows(UserInputException.class, () -> DelimitedReader.read(dir.resolve("none.csv")));
        assertMessage(e, "none.csv", "file not found", "check the path");
    }

    @Test
    void invalidUtf8IsReported() throws Exception {
        Path f = dir.resolve("latin1.csv");
        Files.write(f, new byte[] {'a', '\n', (byte) 0xE9, '\n'});
        UserInputException e = assertThrows(UserInputException.class, () -> DelimitedReader.read(f));
        assertMessage(e, "latin1.csv", "not valid UTF-8", "save it as UTF-8");
    }

    @Test
    void writeThenReadGivesTheSameFieldsAndDoubles() throws Exception {
        SplittableRandom rnd = new SplittableRandom(20261202L);
        String alphabet = "ab ,\"\n\r#\t;x1";
        List<String> columns = List.of("text", "number", "tab");
        List<List<?>> rows = new ArrayList<>();
        for (int i = 0; i < 300; i++) {
            StringBuilder s = new StringBuilder();
            int len = rnd.nextInt(6);
            for (int k = 0; k < len; k++) {
                s.append(alphabet.charAt(rnd.nextInt(alphabet.length())));
            }
            double x = switch (rnd.nextInt(6)) {
                case 0 -> Double.NaN;
                case 1 -> Double.NEGATIVE_INFINITY;
                case 2 -> -0.0;
                default -> Double.longBitsToDouble(rnd.nextLong()) ;
            };
            rows.add(List.of("r" + i + s.toString().strip(), Double.isNaN(x) && rnd.nextBoolean() ? Double.NaN : x,
                    "t\t" + i));
        }
        for (char delimiter : new char[] {',', '\t'}) {
            Path f = dir.resolve(delimiter == ',' ? "rt.csv" : "rt.tsv");
            Files.writeString(f, DelimitedWriter.format(columns, rows, delimiter));
            TextTable t = DelimitedReader.read(f);
            assertEquals(rows.size(), t.rows().size());
            for (int i = 0; i < rows.size(); i++) {
                TextTable.Row r = t.rows().get(i);
                assertEquals(rows.get(i).get(0), r.text("text"), "row " + i);
                double expected = (Double) rows.get(i).get(1);
                // bit-for-bit (NaN payloads aside): DataNumbers.format writes the shortest round-trip decimal
                assertEquals(Double.isNaN(expected) ? Double.doubleToLongBits(Double.NaN)
                        : Double.doubleToRawLongBits(expected), Double.doubleToLongBits(r.number("number")),
                        "row " + i);
                assertEquals("t\t" + i, r.text("tab"));
            }
        }
    }
}
