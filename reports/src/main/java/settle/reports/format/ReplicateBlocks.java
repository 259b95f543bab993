package settle.reports.format;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.CRC32C;
import settle.input.BadInputException;

/**
 * The replicate's binary file {@code arms/<arm>/<replicate>.bin} (README, "Study directory"): the large arrays of a
 * replicate (its rates, θ₀, θ_T, θ̄, tail snapshots, test probabilities and predicted test classes), each in its
 * coding, beside the replicate's JSON, which records this file's length and checksum. Its one writer and its one
 * reader.
 *
 * <p>Layout, every integer a little-endian unsigned 32-bit number:
 * <pre>
 *   magic     8 bytes   "SETTLEBN"
 *   format    u32       the study format ({@link StudyFormat#VERSION})
 *   blocks    u32       n
 *   n times:  name      32 bytes, ASCII, padded with NUL (the JSON path the block stands for, e.g. "snapshots.values")
 *             rows      u32
 *             columns   u32
 *             coding    u32       {@link Coding#id()}
 *             bytes     u32       the length of the block's coded values
 *   n times:  values    rows × columns values, row-major, in the block's coding
 *   crc32c    u32       CRC-32C (Castagnoli) of every byte before it
 * </pre>
 * The same arrays give the same bytes on any machine or JDK: every coding is integer arithmetic on the values' IEEE
 * 754 bits (the float32 rounding is the language's own, round to nearest even, the same on every JVM), and every
 * value that is not finite is written as the one NaN.
 */
public final class ReplicateBlocks {

    /** The file's first eight bytes. */
    static final byte[] MAGIC = "SETTLEBN".getBytes(StandardCharsets.US_ASCII);
    /** The bytes of a block's name. */
    static final int NAME_BYTES = 32;
    /** The bytes of a block's entry in the table: its name, rows, columns, coding and length. */
    static final int ENTRY_BYTES = NAME_BYTES + 16;
    /** The most blocks a file holds (the seven arrays of a replicate, with room). */
    private static final int MAX_BLOCKS = 16;
    /** The one NaN of float64 blocks: "null". */
    private static final long NAN64 = Double.doubleToLongBits(Double.NaN);
    /** The one NaN of float32 blocks. */
    private static final int NAN32 = Float.floatToIntBits(Float.NaN);

    private ReplicateBlocks() {
    }

    /** How a block's values are written. */
    public enum Coding {
        /** IEEE 754 float64, 8 bytes a value: lossless. */
        FLOAT64(1, "float64"),
        /**
         * Lossless float64, each value's bits XOR the previous value's (the first XOR 0), the result without its
         * high zero bytes: first one count of kept bytes (0–8) per value, two to a byte (the earlier value in the low
         * four bits, a last odd count padded with 0), then each value's kept bytes, low-order byte first. A run of equal
         * values (a constant rate) takes half a byte a value.
         */
        FLOAT64_XOR(2, "float64-xor"),
        /**
         * IEEE 754 float32, 4 bytes a value: each float64 rounded to the nearest float32 (ties to even), relative error
         * at most 2⁻²⁴ (absolute at most 2⁻¹⁵⁰ below float32's smallest normal, 2⁻¹²⁶). Lossy: only for arrays whose
         * readers need far fewer digits (README, "Study directory").
         */
        FLOAT32(3, "float32"),
        /**
         * Whole numbers from 0 (class indices): 1, 2 or 4 bytes a value, unsigned, as the block's length says; the
         * writer takes the fewest that hold its largest value.
         */
        INDEX(4, "index");

        private final int id;
        private final String word;

        Coding(int id, String word) {
            this.id = id;
            this.word = word;
        }

        /** @return the number the block table records */
        public int id() {
            return id;
        }

        /** @return the coding's name in the README */
        public String word() {
            return word;
        }

        static Coding of(int id) {
            for (Coding c : values()) {
                if (c.id == id) {
                    return c;
                }
            }
            return null;
        }
    }

    /**
     * One array of the file.
     *
     * @param name the JSON path it stands for
     * @param rows rows (1 for a vector)
     * @param columns columns (the vector's length for a vector)
     * @param coding how its values are written
     * @param values rows × columns values, row-major
     */
    public record Block(String name, int rows, int columns, Coding coding, double[] values) {
        public Block {
            if ((long) rows * columns != values.length) {
                throw new IllegalArgumentException(name + ": " + rows + " × " + columns + " is not " + values.length);
            }
            if (name.isEmpty() || name.length() > NAME_BYTES || !StandardCharsets.US_ASCII.newEncoder().canEncode(name)) {
                throw new IllegalArgumentException("block name " + name);
            }
        }
    }

    /**
     * @return the coding a lossy block is written in: {@link Coding#FLOAT32}, unless a finite value lies beyond
     *     float32's range (it would become infinite), then {@link Coding#FLOAT64}
     */
    public static Coding float32Unless(double[] values) {
        for (double v : values) {
            if (Double.isFinite(v) && Float.isInfinite((float) v)) {
                return Coding.FLOAT64;
            }
        }
        return Coding.FLOAT32;
    }

    /** @return the file's bytes */
    public static byte[] write(List<Block> blocks) {
        List<byte[]> coded = new ArrayList<>();
        long size = MAGIC.length + 8L + (long) blocks.size() * ENTRY_BYTES + 4;
        for (Block b : blocks) {
            byte[] c = encode(b);
            coded.add(c);
            size += c.length;
        }
        if (size > Integer.MAX_VALUE - 16) {
            throw new IllegalArgumentException("a replicate's arrays take " + size + " bytes, more than one file holds");
        }
        ByteBuffer out = ByteBuffer.allocate((int) size).order(ByteOrder.LITTLE_ENDIAN);
        out.put(MAGIC).putInt(StudyFormat.VERSION).putInt(blocks.size());
        for (int i = 0; i < blocks.size(); i++) {
            Block b = blocks.get(i);
            byte[] name = b.name().getBytes(StandardCharsets.US_ASCII);
            out.put(name).put(new byte[NAME_BYTES - name.length]).putInt(b.rows()).putInt(b.columns())
                    .putInt(b.coding().id()).putInt(coded.get(i).length);
        }
        for (byte[] c : coded) {
            out.put(c);
        }
        out.putInt((int) crc(out.array(), out.position()));
        return out.array();
    }

    private static byte[] encode(Block b) {
        double[] v = b.values();
        return switch (b.coding()) {
            case FLOAT64 -> {
                ByteBuffer out = ByteBuffer.allocate(8 * v.length).order(ByteOrder.LITTLE_ENDIAN);
                for (double x : v) {
                    out.putLong(bits(x));
                }
                yield out.array();
            }
            case FLOAT32 -> {
                ByteBuffer out = ByteBuffer.allocate(4 * v.length).order(ByteOrder.LITTLE_ENDIAN);
                for (double x : v) {
                    float f = (float) x;
                    if (Double.isFinite(x) && Float.isInfinite(f)) {
                        throw new IllegalArgumentException(b.name() + ": " + x + " is beyond float32");
                    }
                    out.putInt(Double.isFinite(x) ? Float.floatToRawIntBits(f) : NAN32);
                }
                yield out.array();
            }
            case FLOAT64_XOR -> xor(v);
            case INDEX -> {
                double largest = 0;
                for (double x : v) {
                    if (!(x >= 0 && x <= 0xffff_ffffL && x == Math.rint(x))) {
                        throw new IllegalArgumentException(b.name() + ": " + x + " is not an index");
                    }
                    largest = Math.max(largest, x);
                }
                int width = largest < 1 << 8 ? 1 : largest < 1 << 16 ? 2 : 4;
                ByteBuffer out = ByteBuffer.allocate(width * v.length).order(ByteOrder.LITTLE_ENDIAN);
                for (double x : v) {
                    long n = (long) x;
                    switch (width) {
                        case 1 -> out.put((byte) n);
                        case 2 -> out.putShort((short) n);
                        default -> out.putInt((int) n);
                    }
                }
                yield out.array();
            }
        };
    }

    /** @return the value's bits, the one NaN for a value that is not finite */
    private static long bits(double x) {
        return Double.isFinite(x) ? Double.doubleToRawLongBits(x) : NAN64;
    }

    /** @return the bytes of {@link Coding#FLOAT64_XOR} */
    private static byte[] xor(double[] v) {
        int m = v.length;
        int[] kept = new int[m];
        long[] words = new long[m];
        long previous = 0;
        int size = (m + 1) / 2;
        for (int i = 0; i < m; i++) {
            long b = bits(v[i]);
            long x = b ^ previous;
            previous = b;
            words[i] = x;
            kept[i] = (64 - Long.numberOfLeadingZeros(x) + 7) / 8;
            size += kept[i];
        }
        byte[] out = new byte[size];
        for (int i = 0; i < m; i++) {
            out[i / 2] |= (byte) (kept[i] << (4 * (i % 2)));
        }
        int at = (m + 1) / 2;
        for (int i = 0; i < m; i++) {
            long x = words[i];
            for (int j = 0; j < kept[i]; j++) {
                out[at++] = (byte) (x >>> (8 * j));
            }
        }
        return out;
    }

    /** @return the CRC-32C of the first {@code length} bytes */
    static long crc(byte[] bytes, int length) {
        CRC32C c = new CRC32C();
        c.update(bytes, 0, length);
        return c.getValue();
    }

    /**
     * @return the checksum as the JSON records it, eight lower-case hexadecimal digits: the CRC-32C of every byte but
     *     the last four (the value the file ends with, when it is whole). Not the CRC of the whole file: a CRC taken over
     *     data followed by its own CRC is the same constant for every file.
     */
    public static String checksum(byte[] file) {
        return String.format("%08x", crc(file, Math.max(0, file.length - 4)));
    }

    /**
     * Reads and checks the file: its magic, format, block table, codings, length and checksum.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @return the blocks by name, in file order, decoded to float64 (a float32 value exactly, an index as a whole
     *     number, NaN for null)
     * @throws BadInputException naming the file and what is wrong with it
     */
    public static Map<String, Block> read(byte[] bytes, String file) {
        if (bytes.length < MAGIC.length + 12) {
            throw BadInputException.inFile(file, "", "holds " + bytes.length + " bytes, too few for a replicate's"
                    + " binary file (it starts with SETTLEBN, its format and its blocks)");
        }
        ByteBuffer in = ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN);
        for (byte m : MAGIC) {
            if (in.get() != m) {
                throw BadInputException.inFile(file, "", "does not start with SETTLEBN; expected a replicate's binary"
                        + " file");
            }
        }
        long stored = Integer.toUnsignedLong(ByteBuffer.wrap(bytes, bytes.length - 4, 4).order(ByteOrder.LITTLE_ENDIAN)
                .getInt());
        long actual = crc(bytes, bytes.length - 4);
        if (stored != actual) {
            throw BadInputException.inFile(file, "", String.format("its CRC-32C is %08x but it records %08x: the file"
                    + " is damaged", actual, stored));
        }
        int format = in.getInt();
        if (format != StudyFormat.VERSION) {
            throw BadInputException.inFile(file, "format", "this file is in format " + Integer.toUnsignedString(format)
                    + "; this settle reads format " + StudyFormat.VERSION);
        }
        long count = Integer.toUnsignedLong(in.getInt());
        if (count > MAX_BLOCKS || in.position() + count * ENTRY_BYTES + 4 > bytes.length) {
            throw BadInputException.inFile(file, "blocks", "records " + count + " blocks, more than the file's "
                    + bytes.length + " bytes hold");
        }
        List<String> names = new ArrayList<>();
        long[] rows = new long[(int) count];
        long[] columns = new long[(int) count];
        Coding[] codings = new Coding[(int) count];
        long[] lengths = new long[(int) count];
        long total = 0;
        for (int i = 0; i < count; i++) {
            byte[] raw = new byte[NAME_BYTES];
            in.get(raw);
            int end = 0;
            while (end < NAME_BYTES && raw[end] != 0) {
                end++;
            }
            for (int j = end; j < NAME_BYTES; j++) {
                if (raw[j] != 0) {
                    throw BadInputException.inFile(file, "blocks[" + i + "]", "the name is not NUL-padded ASCII");
                }
            }
            String name = new String(raw, 0, end, StandardCharsets.US_ASCII);
            if (end == 0 || !name.matches("[a-z_.]+") || names.contains(name)) {
                throw BadInputException.inFile(file, "blocks[" + i + "]", "the name "
                        + BadInputException.shown(name) + " is empty, not a lower-case path or named twice");
            }
            names.add(name);
            rows[i] = Integer.toUnsignedLong(in.getInt());
            columns[i] = Integer.toUnsignedLong(in.getInt());
            long id = Integer.toUnsignedLong(in.getInt());
            codings[i] = id > 255 ? null : Coding.of((int) id);
            lengths[i] = Integer.toUnsignedLong(in.getInt());
            // each below 2³², so their product is below 2⁶⁴ but may pass 2⁶³: compare before multiplying
            if (rows[i] != 0 && columns[i] > Integer.MAX_VALUE / rows[i]) {
                throw BadInputException.inFile(file, name, "records " + rows[i] + " × " + columns[i] + " values; a"
                        + " block holds at most " + Integer.MAX_VALUE);
            }
            long values = rows[i] * columns[i];
            if (codings[i] == null) {
                throw BadInputException.inFile(file, name, "its coding is " + id + "; expected 1 (float64), 2"
                        + " (float64-xor), 3 (float32) or 4 (index)");
            }
            boolean fits = switch (codings[i]) {
                case FLOAT64 -> lengths[i] == 8 * values;
                case FLOAT32 -> lengths[i] == 4 * values;
                case INDEX -> lengths[i] == values || lengths[i] == 2 * values || lengths[i] == 4 * values;
                case FLOAT64_XOR -> lengths[i] >= (values + 1) / 2 && lengths[i] <= (values + 1) / 2 + 8 * values;
            };
            if (!fits) {
                throw BadInputException.inFile(file, name, "records " + lengths[i] + " bytes for " + rows[i] + " × "
                        + columns[i] + " values in " + codings[i].word());
            }
            total += lengths[i];
        }
        long expectedLength = in.position() + total + 4;
        if (expectedLength != bytes.length) {
            throw BadInputException.inFile(file, "", "holds " + bytes.length + " bytes; its blocks make "
                    + expectedLength);
        }
        Map<String, Block> out = new LinkedHashMap<>();
        for (int i = 0; i < count; i++) {
            int n = (int) (rows[i] * columns[i]);
            double[] v = new double[n];
            int at = in.position();
            switch (codings[i]) {
                case FLOAT64 -> {
                    for (int j = 0; j < n; j++) {
                        v[j] = in.getDouble();
                    }
                }
                case FLOAT32 -> {
                    for (int j = 0; j < n; j++) {
                        v[j] = in.getFloat();
                    }
                }
                case INDEX -> {
                    int width = (int) (lengths[i] / Math.max(1, n));
                    for (int j = 0; j < n; j++) {
                        v[j] = width == 1 ? Byte.toUnsignedInt(in.get()) : width == 2 ? Short.toUnsignedInt(
                                in.getShort()) : Integer.toUnsignedLong(in.getInt());
                    }
                }
                case FLOAT64_XOR -> unxor(bytes, at, (int) lengths[i], v, file, names.get(i));
            }
            in.position(at + (int) lengths[i]);
            out.put(names.get(i), new Block(names.get(i), (int) rows[i], (int) columns[i], codings[i], v));
        }
        return out;
    }

    /** Decodes {@link Coding#FLOAT64_XOR} into {@code v}, refusing counts beyond 8 or bytes that do not add up. */
    private static void unxor(byte[] bytes, int from, int length, double[] v, String file, String name) {
        int m = v.length;
        int at = from + (m + 1) / 2;
        int end = from + length;
        long previous = 0;
        for (int i = 0; i < m; i++) {
            int kept = (bytes[from + i / 2] >>> (4 * (i % 2))) & 0xf;
            if (kept > 8 || at + kept > end) {
                throw BadInputException.inFile(file, name, "value " + (i + 1) + " records " + kept + " bytes; the"
                        + " block's counts are 0 to 8 and its bytes hold them");
            }
            long x = 0;
            for (int j = 0; j < kept; j++) {
                x |= (bytes[at++] & 0xffL) << (8 * j);
            }
            if (kept > 0 && bytes[at - 1] == 0) {
                throw BadInputException.inFile(file, name, "value " + (i + 1) + " keeps a high zero byte; the coding"
                        + " leaves every high zero byte out");
            }
            previous ^= x;
            v[i] = Double.longBitsToDouble(previous);
        }
        if (at != end) {
            throw BadInputException.inFile(file, name, "its counts make " + (at - from) + " bytes; it records "
                    + length);
        }
        if (m % 2 == 1 && (bytes[from + m / 2] & 0xf0) != 0) {
            throw BadInputException.inFile(file, name, "the count after the last value is not 0");
        }
    }
}
