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
 * replicate (its rates, θ₀, θ_T, θ̄, tail snapshots and test probabilities) as little-endian float64, beside the
 * replicate's JSON, which records this file's length and checksum. Its one writer and its one reader.
 *
 * <p>Layout, every integer a little-endian unsigned 32-bit number:
 * <pre>
 *   magic     8 bytes   "SETTLEBN"
 *   format    u32       the study format ({@link StudyFormat#VERSION})
 *   blocks    u32       n
 *   n times:  name      32 bytes, ASCII, padded with NUL (the JSON path the block stands for, e.g. "snapshots.values")
 *             rows      u32
 *             columns   u32
 *   n times:  values    rows × columns float64, row-major; NaN (one bit pattern, 0x7ff8000000000000) is "null"
 *   crc32c    u32       CRC-32C (Castagnoli) of every byte before it
 * </pre>
 * The same arrays give the same bytes on any machine or JDK: values are written as their IEEE 754 bits, and every
 * value that is not finite as the one NaN.
 */
public final class ReplicateBlocks {

    /** The file's first eight bytes. */
    static final byte[] MAGIC = "SETTLEBN".getBytes(StandardCharsets.US_ASCII);
    /** The bytes of a block's name. */
    static final int NAME_BYTES = 32;
    /** The most blocks a file holds (the six arrays of a replicate). */
    private static final int MAX_BLOCKS = 16;

    private ReplicateBlocks() {
    }

    /**
     * One array of the file.
     *
     * @param name the JSON path it stands for
     * @param rows rows (1 for a vector)
     * @param columns columns (the vector's length for a vector)
     * @param values rows × columns values, row-major
     */
    public record Block(String name, int rows, int columns, double[] values) {
        public Block {
            if ((long) rows * columns != values.length) {
                throw new IllegalArgumentException(name + ": " + rows + " × " + columns + " is not " + values.length);
            }
            if (name.isEmpty() || name.length() > NAME_BYTES || !StandardCharsets.US_ASCII.newEncoder().canEncode(name)) {
                throw new IllegalArgumentException("block name " + name);
            }
        }
    }

    /** @return the file's bytes */
    public static byte[] write(List<Block> blocks) {
        long size = MAGIC.length + 8L + (long) blocks.size() * (NAME_BYTES + 8) + 4;
        for (Block b : blocks) {
            size += 8L * b.values().length;
        }
        if (size > Integer.MAX_VALUE - 16) {
            throw new IllegalArgumentException("a replicate's arrays take " + size + " bytes, more than one file holds");
        }
        ByteBuffer out = ByteBuffer.allocate((int) size).order(ByteOrder.LITTLE_ENDIAN);
        out.put(MAGIC).putInt(StudyFormat.VERSION).putInt(blocks.size());
        for (Block b : blocks) {
            byte[] name = b.name().getBytes(StandardCharsets.US_ASCII);
            out.put(name).put(new byte[NAME_BYTES - name.length]).putInt(b.rows()).putInt(b.columns());
        }
        for (Block b : blocks) {
            for (double v : b.values()) {
                out.putLong(Double.isFinite(v) ? Double.doubleToRawLongBits(v) : Double.doubleToLongBits(Double.NaN));
            }
        }
        out.putInt((int) crc(out.array(), out.position()));
        return out.array();
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
     * Reads and checks the file: its magic, format, block table, length and checksum.
     *
     * @param bytes the file's content
     * @param file the file as messages name it
     * @return the blocks by name, in file order
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
        if (count > MAX_BLOCKS || in.position() + count * (NAME_BYTES + 8) + 4 > bytes.length) {
            throw BadInputException.inFile(file, "blocks", "records " + count + " blocks, more than the file's "
                    + bytes.length + " bytes hold");
        }
        List<String> names = new ArrayList<>();
        long[] rows = new long[(int) count];
        long[] columns = new long[(int) count];
        long values = 0;
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
            values += rows[i] * columns[i];
        }
        long expectedLength = in.position() + 8 * values + 4;
        if (expectedLength != bytes.length) {
            throw BadInputException.inFile(file, "", "holds " + bytes.length + " bytes; its blocks make "
                    + expectedLength);
        }
        Map<String, Block> out = new LinkedHashMap<>();
        for (int i = 0; i < count; i++) {
            double[] v = new double[(int) (rows[i] * columns[i])];
            for (int j = 0; j < v.length; j++) {
                v[j] = in.getDouble();
            }
            out.put(names.get(i), new Block(names.get(i), (int) rows[i], (int) columns[i], v));
        }
        return out;
    }
}
