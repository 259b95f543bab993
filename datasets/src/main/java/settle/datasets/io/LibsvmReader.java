package settle.datasets.io;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import settle.input.BadInputException;
import settle.datasets.Dataset;

/**
 * Reads the LIBSVM / SVMlight text format into a dense {@link Dataset}, in one streaming pass.
 *
 * <p>Rules: one example per line, {@code label index:value index:value …}, fields separated by blanks
 * (spaces or tabs); the label is a number; indices are positive integers, strictly ascending within a line
 * (1-based: index j is feature {@code fj}); a missing index means the value 0; the width is the largest index
 * in the file. Everything from {@code #} to the end of a line is a comment; blank lines are skipped. UTF-8,
 * with or without a byte-order mark. Classes are the distinct labels in numeric order ({@code +1} and
 * {@code 1} are one class, named {@code 1}).
 *
 * <p>Caps, so that a huge sparse file fails with a message rather than running out of memory: an index
 * above {@value #MAX_FEATURES} is an error, and so is a dense matrix of more than {@value #MAX_VALUES}
 * values (1.6 GB). SVMlight's {@code qid:} query ids and multi-label lines are not accepted.
 * Every error is a {@link BadInputException} naming the file, line and character column.
 */
public final class LibsvmReader {

    /** The widest accepted file: the largest feature index. */
    public static final int MAX_FEATURES = 100_000;

    /** The most values of the dense matrix (rows × width). */
    public static final long MAX_VALUES = 200_000_000L;

    private LibsvmReader() {
    }

    /**
     * @param file the file to read (UTF-8)
     * @param shownAs how messages and the dataset name refer to it
     * @throws BadInputException for a missing or unreadable file and for every malformed line
     */
    public static Dataset read(Path file, String shownAs) {
        try (InputStream in = Files.newInputStream(file)) {
            return read(in, shownAs);
        } catch (NoSuchFileException e) {
            throw BadInputException.inFile(shownAs, "", "no such file");
        } catch (IOException e) {
            throw BadInputException.inFile(shownAs, "", "cannot read: " + e.getMessage()).because(e);
        }
    }

    /** As {@link #read(Path, String)}, from a UTF-8 byte stream (not closed). */
    public static Dataset read(InputStream in, String shownAs) {
        BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPLACE)
                .onUnmappableCharacter(CodingErrorAction.REPLACE)), 1 << 16);
        long[] lineNo = {0};
        try {
            return parse(reader, shownAs, lineNo);
        } catch (IOException e) {
            throw BadInputException.inFile(shownAs, "", "cannot read: " + e.getMessage()).because(e);
        }
    }

    private static Dataset parse(BufferedReader reader, String src, long[] lineNo) throws IOException {
        LabelIndex labels = new LabelIndex();
        int[] rowEnd = new int[1024];
        int[] index = new int[4096];
        DoubleGrower values = new DoubleGrower();
        int entries = 0;
        int width = 0;
        String text;
        while ((text = reader.readLine()) != null) {
            long line = ++lineNo[0];
            if (line == 1 && !text.isEmpty() && text.charAt(0) == '\uFEFF') {
                text = " " + text.substring(1); // keep character columns as in the file
            }
            int end = text.indexOf('#');
            if (end < 0) {
                end = text.length();
            }
            int bad = text.indexOf('\uFFFD');
            if (bad >= 0 && bad < end) {
                throw BadInputException.atCell(src, line, bad + 1, null, "not valid UTF-8 text (a byte sequence that UTF-8 "
                        + "does not allow, or U+FFFD); expected a UTF-8 encoded file");
            }
            int pos = skipBlanks(text, 0, end);
            if (pos == end) {
                continue;
            }
            int tokenEnd = tokenEnd(text, pos, end);
            String label = text.substring(pos, tokenEnd);
            int kind = Numbers.classify(label);
            if (kind != Numbers.OK) {
                String why = kind == Numbers.INVALID ? "expected a numeric label, found " + BadInputException.shown(label)
                        : "label " + BadInputException.shown(label) + " is not a finite number; expected a numeric label";
                throw BadInputException.atCell(src, line, pos + 1, null, why);
            }
            int previous = 0;
            pos = skipBlanks(text, tokenEnd, end);
            while (pos < end) {
                tokenEnd = tokenEnd(text, pos, end);
                String token = text.substring(pos, tokenEnd);
                int colon = token.indexOf(':');
                if (colon < 0) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "missing ':' in " + BadInputException.shown(token)
                            + "; expected index:value");
                }
                String idx = token.substring(0, colon);
                if (idx.equals("qid")) {
                    throw BadInputException.atCell(src, line, pos + 1, null,
                            "query ids ('qid:') are not accepted; expected index:value pairs only");
                }
                int feature = parseIndex(idx);
                if (feature < 0) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "expected a positive integer index before ':', found "
                            + BadInputException.shown(idx));
                }
                if (feature == 0) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "index 0; expected indices from 1");
                }
                if (feature > MAX_FEATURES) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "index " + idx + " is above the width cap of "
                            + MAX_FEATURES + " features; expected indices from 1 to " + MAX_FEATURES);
                }
                if (feature == previous) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "duplicate index " + feature
                            + "; expected each index at most once per line");
                }
                if (feature < previous) {
                    throw BadInputException.atCell(src, line, pos + 1, null, "index " + feature + " after index " + previous
                            + "; expected ascending indices");
                }
                String value = token.substring(colon + 1);
                int vk = Numbers.classify(value);
                if (vk != Numbers.OK) {
                    String why = vk == Numbers.EMPTY ? "no value after '" + idx + ":'; expected a finite number"
                            : Numbers.problem(vk, value);
                    throw BadInputException.atCell(src, line, pos + colon + 2, null, why);
                }
                if (entries == index.length) {
                    index = Arrays.copyOf(index, index.length * 2);
                }
                index[entries++] = feature - 1;
                values.add(Numbers.parse(value));
                previous = feature;
                width = Math.max(width, feature);
                pos = skipBlanks(text, tokenEnd, end);
            }
            labels.add(label.strip());
            int rows = labels.rows();
            if (rows > rowEnd.length) {
                rowEnd = Arrays.copyOf(rowEnd, rowEnd.length * 2);
            }
            rowEnd[rows - 1] = entries;
            if ((long) rows * width > MAX_VALUES) {
                throw BadInputException.atLine(src, line, rows + " rows × " + width + " features exceed the cap of "
                        + MAX_VALUES + " dense values; expected a smaller file");
            }
        }
        if (labels.rows() == 0) {
            throw BadInputException.inFile(src, "", "no data lines; expected lines of 'label index:value ...'");
        }
        if (width == 0) {
            throw BadInputException.inFile(src, "", "no feature values on any line; expected 'label index:value ...'");
        }
        labels.finish();
        if (labels.classNames().size() < 2) {
            throw BadInputException.inFile(src, "", "one class only (" + BadInputException.shown(labels.classNames().get(0))
                    + "); expected at least two classes");
        }
        int rows = labels.rows();
        double[] x = new double[rows * width];
        int start = 0;
        for (int r = 0; r < rows; r++) {
            for (int e = start; e < rowEnd[r]; e++) {
                x[r * width + index[e]] = values.get(e);
            }
            start = rowEnd[r];
        }
        List<String> names = new ArrayList<>(width);
        for (int j = 1; j <= width; j++) {
            names.add("f" + j);
        }
        return new Dataset(src, x, labels.labels(), names, labels.classNames());
    }

    /** @return the index value, or −1 when the text is not a plain run of digits */
    private static int parseIndex(String s) {
        if (s.isEmpty() || s.length() > 10) {
            return s.isEmpty() || !s.chars().allMatch(Character::isDigit) ? -1 : Integer.MAX_VALUE;
        }
        long v = 0;
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c < '0' || c > '9') {
                return -1;
            }
            v = v * 10 + (c - '0');
        }
        return (int) Math.min(v, Integer.MAX_VALUE);
    }

    private static int skipBlanks(String s, int i, int end) {
        while (i < end && (s.charAt(i) == ' ' || s.charAt(i) == '\t')) {
            i++;
        }
        return i;
    }

    private static int tokenEnd(String s, int i, int end) {
        while (i < end && s.charAt(i) != ' ' && s.charAt(i) != '\t') {
            i++;
        }
        return i;
    }
}
