package settle.datasets.table;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.io.InputStream;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import org.junit.jupiter.api.Test;
import settle.datasets.Dataset;
import settle.datasets.Randomness;
import settle.datasets.io.CsvReader;

/**
 * A numeric table read through the table path ({@link TableReader}, then {@link TableEncoder} with the default keys
 * and every row training) gives the same dataset as {@link CsvReader}, the reader user tables went through before
 * (and the bundled data still do): the same names, classes, labels and feature values bit for bit.
 */
class NumericTableEqualityTest {

    /** @return the dataset the table path makes of {@code text} */
    static Dataset throughTable(String text, String label, char delimiter) {
        SourceTable table = TableReader.read(text, "t.csv", label, delimiter);
        int[] all = new int[table.rows()];
        for (int r = 0; r < all.length; r++) {
            all[r] = r;
        }
        return TableEncoder.prepare(table, TableOptions.DEFAULTS, all, new int[0], new int[0]).all();
    }

    static void assertSame(Dataset expected, Dataset actual, String what) {
        assertEquals(expected.featureNames(), actual.featureNames(), what);
        assertEquals(expected.classNames(), actual.classNames(), what);
        assertArrayEquals(expected.labels(), actual.labels(), what);
        double[] e = expected.featureMatrix();
        double[] a = actual.featureMatrix();
        assertEquals(e.length, a.length, what);
        for (int i = 0; i < e.length; i++) {
            if (Double.doubleToRawLongBits(e[i]) != Double.doubleToRawLongBits(a[i])) {
                assertEquals(e[i], a[i], 0.0, what + ": value " + i + " differs in its bits");
            }
        }
    }

    @Test
    void generatedNumericTablesInManySpellingsGiveTheSameBits() {
        RandomGenerator random = Randomness.create(16);
        for (int table = 0; table < 40; table++) {
            String text = numericTable(random, table);
            char delimiter = table % 5 == 4 ? CsvReader.DETECT : new char[] {',', ';', '\t', ','}[table % 4];
            String label = table % 3 == 0 ? null : "label";
            Dataset expected = CsvReader.read(new StringReader(text), "t.csv", label, delimiter);
            assertSame(expected, throughTable(text, label, delimiter == CsvReader.DETECT ? TableReader.DETECT
                    : delimiter), "table " + table);
        }
    }

    @Test
    void bundledFilesGiveTheSameBits() throws IOException {
        String[][] files = {{"wdbc.csv", "diagnosis"}, {"wine.csv", "cultivar"}, {"satellite.csv", "cover"}};
        for (String[] f : files) {
            String text;
            try (InputStream in = Dataset.class.getResourceAsStream("/settle/datasets/bundled/" + f[0])) {
                text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
            }
            Dataset expected = CsvReader.read(new StringReader(text), "t.csv", f[1], ',');
            assertSame(expected, throughTable(text, f[1], ','), f[0]);
        }
    }

    /**
     * A table of numbers in the spellings the CSV rules accept: integers, signs, leading and trailing points,
     * exponents, blanks around fields, quoted numbers, quoted header names with delimiters inside, CR, LF and CRLF
     * line ends, blank lines, a byte-order mark; numeric or text labels in the label column, placed first, last or
     * in between.
     */
    private static String numericTable(RandomGenerator random, int index) {
        char delimiter = new char[] {',', ';', '\t', ','}[index % 4];
        int columns = 2 + random.nextInt(12);
        int rows = 1 + random.nextInt(300);
        int labelAt = index % 3 == 0 ? columns - 1 : random.nextInt(columns);
        String newline = new String[] {"\n", "\r\n", "\r"}[random.nextInt(3)];
        boolean textLabels = random.nextBoolean();
        int classes = 2 + random.nextInt(4);
        StringBuilder b = new StringBuilder();
        if (index % 7 == 0) {
            b.append('\uFEFF');
        }
        List<String> names = new ArrayList<>();
        for (int c = 0; c < columns; c++) {
            names.add(c == labelAt ? "label" : "x" + c + (c % 4 == 1 ? " \"q\"" + delimiter + "d" : ""));
        }
        for (int c = 0; c < columns; c++) {
            if (c > 0) {
                b.append(delimiter);
            }
            String n = names.get(c);
            b.append(n.indexOf('"') >= 0 ? "\"" + n.replace("\"", "\"\"") + "\"" : n);
        }
        b.append(newline);
        for (int r = 0; r < rows; r++) {
            if (random.nextInt(25) == 0) {
                b.append(newline);
            }
            for (int c = 0; c < columns; c++) {
                if (c > 0) {
                    b.append(delimiter);
                }
                if (c == labelAt) {
                    int k = r < classes ? r : random.nextInt(classes);
                    b.append(textLabels ? "class " + (char) ('a' + k) : new String[] {"0", "1.0", "+2", "3", "4e0"}[k]);
                } else {
                    b.append(number(random));
                }
            }
            if (r < rows - 1 || random.nextBoolean()) {
                b.append(newline);
            }
        }
        return b.toString();
    }

    private static String number(RandomGenerator random) {
        double v = (random.nextDouble() - 0.5) * Math.pow(10, random.nextInt(12) - 6);
        String s = switch (random.nextInt(9)) {
            case 0 -> Long.toString(random.nextLong(-1000, 1000));
            case 1 -> Double.toString(v);
            case 2 -> String.format(java.util.Locale.ROOT, "%.6e", v);
            case 3 -> String.format(java.util.Locale.ROOT, "%.17g", v);
            case 4 -> "+" + Math.abs(random.nextInt(100)) + ".";
            case 5 -> "." + random.nextInt(1000);
            case 6 -> String.format(java.util.Locale.ROOT, "%.3E", v).replace("E-0", "E-");
            case 7 -> "-0";
            default -> String.format(java.util.Locale.ROOT, "%.4f", v);
        };
        return switch (random.nextInt(6)) {
            case 0 -> " " + s + " ";
            case 1 -> "\"" + s + "\"";
            default -> s;
        };
    }
}
