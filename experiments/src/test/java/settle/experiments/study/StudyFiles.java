package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.zip.CRC32C;

/** Test helpers over the replicate files of a study directory. */
public final class StudyFiles {

    private StudyFiles() {
    }

    /**
     * @return every replicate file {@code study/arms/ARM/R.json}, sorted by path. Reads names only (no file
     *     attributes), so a run writing beside it cannot make it fail: a partial file renamed between the listing
     *     and a stat would otherwise vanish under the walk.
     */
    public static List<Path> replicateFiles(Path study) throws Exception {
        List<Path> files = new ArrayList<>();
        try (var arms = Files.newDirectoryStream(study.resolve("arms"))) {
            for (Path arm : arms) {
                if (!Files.isDirectory(arm)) {
                    continue;
                }
                try (var entries = Files.newDirectoryStream(arm)) {
                    for (Path entry : entries) {
                        if (entry.getFileName().toString().endsWith(".json")) {
                            files.add(entry);
                        }
                    }
                }
            }
        }
        files.sort(null);
        return files;
    }

    private static final ObjectMapper MAPPER = new ObjectMapper();

    /**
     * @param a the arm's index in the study's plan, from 1
     * @return the directory of the arm's replicate files, as the study's manifest.json names it ({@code arms/<id>})
     */
    public static Path arm(Path study, int a) throws Exception {
        String directory = MAPPER.readTree(study.resolve("manifest.json").toFile()).path("arms").get(a - 1)
                .path("directory").asText();
        return study.resolve(directory);
    }

    /**
     * Reads a replicate's JSON and, independently of settle's reader, its binary file {@code <k>.bin} as the README
     * spells it (magic "SETTLEBN", format, block table, each block in its coding, CRC-32C of the rest), checks that the
     * JSON records the binary file's length and checksum, and puts each array back where format 2 wrote it in the
     * JSON (NaN as null), so that tests read a replicate as one tree.
     */
    public static ObjectNode replicate(Path json) throws Exception {
        ObjectNode r = (ObjectNode) MAPPER.readTree(json.toFile());
        byte[] bin = Files.readAllBytes(binary(json));
        assertEquals(bin.length, r.path("binary").path("bytes").asLong(), "binary.bytes of " + json);
        CRC32C crc = new CRC32C();
        crc.update(bin, 0, bin.length - 4);
        assertEquals(String.format("%08x", crc.getValue()), r.path("binary").path("crc32c").asText(),
                "the JSON records the CRC-32C of the binary file's bytes before its own checksum");
        ByteBuffer in = ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN);
        byte[] magic = new byte[8];
        in.get(magic);
        assertEquals("SETTLEBN", new String(magic, StandardCharsets.US_ASCII));
        assertEquals(r.path("format").asInt(), in.getInt(), "the binary file's format is the JSON's");
        int count = in.getInt();
        String[] names = new String[count];
        int[] sizes = new int[count];
        int[] codings = new int[count];
        int[] lengths = new int[count];
        for (int i = 0; i < count; i++) {
            byte[] raw = new byte[32];
            in.get(raw);
            names[i] = new String(raw, StandardCharsets.US_ASCII).replace("\0", "");
            sizes[i] = in.getInt() * in.getInt();
            codings[i] = in.getInt();
            lengths[i] = in.getInt();
        }
        for (int i = 0; i < count; i++) {
            ArrayNode values = MAPPER.createArrayNode();
            int end = in.position() + lengths[i];
            long previous = 0;
            int kept = in.position() + (sizes[i] + 1) / 2;
            for (int j = 0; j < sizes[i]; j++) {
                double v = switch (codings[i]) {
                    case 1 -> in.getDouble();
                    case 3 -> in.getFloat();
                    case 4 -> lengths[i] == sizes[i] ? in.get() & 0xff : lengths[i] == 2 * sizes[i]
                            ? in.getShort() & 0xffff : in.getInt() & 0xffffffffL;
                    case 2 -> {
                        // the XOR of this value's bits with the previous value's, its high zero bytes left out
                        int n = (bin[in.position() + j / 2] >>> (4 * (j % 2))) & 0xf;
                        long x = 0;
                        for (int b = 0; b < n; b++) {
                            x |= (bin[kept++] & 0xffL) << (8 * b);
                        }
                        previous ^= x;
                        yield Double.longBitsToDouble(previous);
                    }
                    default -> throw new AssertionError("coding " + codings[i] + " of " + names[i]);
                };
                if (Double.isNaN(v)) {
                    values.addNull();
                } else {
                    values.add(v);
                }
            }
            if (codings[i] == 2) {
                assertEquals(end, kept, "the XOR-coded bytes of " + names[i] + " fill its length");
            }
            in.position(end);
            int dot = names[i].indexOf('.');
            ObjectNode into = dot < 0 ? r : (ObjectNode) r.get(names[i].substring(0, dot));
            into.set(dot < 0 ? names[i] : names[i].substring(dot + 1), values);
        }
        assertEquals(bin.length - 4, in.position(), "the checksum follows the last block");
        int stored = in.getInt();
        CRC32C rest = new CRC32C();
        rest.update(bin, 0, bin.length - 4);
        assertEquals((int) rest.getValue(), stored, "the stored CRC-32C");
        return r;
    }

    /** Asserts that two study directories hold the same replicate files (JSON and binary), byte for byte. */
    public static void assertSameReplicateFiles(Path a, Path b) throws Exception {
        List<Path> left = replicateFiles(a);
        List<Path> right = replicateFiles(b);
        assertEquals(left.size(), right.size());
        for (int i = 0; i < left.size(); i++) {
            assertEquals(a.relativize(left.get(i)), b.relativize(right.get(i)));
            assertArrayEquals(Files.readAllBytes(left.get(i)), Files.readAllBytes(right.get(i)),
                    "replicate file " + a.relativize(left.get(i)) + " differs");
            Path leftBin = binary(left.get(i));
            assertArrayEquals(Files.readAllBytes(leftBin), Files.readAllBytes(binary(right.get(i))),
                    "binary file " + a.relativize(leftBin) + " differs");
        }
    }

    /**
     * Asserts that arm i of study {@code b} holds the same replicates as arm i of study {@code a}, for every arm, where
     * the arms' specifications (so their ids) may differ while their replicates cannot (a manual arm and its replay
     * with the nudges fixed): the binary files byte for byte, the JSON files byte for byte but for {@code arm_id}.
     */
    public static void assertSameReplicatesUnderOtherIds(Path a, Path b) throws Exception {
        JsonNode armsA = MAPPER.readTree(a.resolve("manifest.json").toFile()).path("arms");
        JsonNode armsB = MAPPER.readTree(b.resolve("manifest.json").toFile()).path("arms");
        assertEquals(armsA.size(), armsB.size());
        for (int i = 0; i < armsA.size(); i++) {
            String idA = armsA.get(i).path("id").asText();
            String idB = armsB.get(i).path("id").asText();
            Path dirA = a.resolve(armsA.get(i).path("directory").asText());
            Path dirB = b.resolve(armsB.get(i).path("directory").asText());
            List<String> names = new ArrayList<>();
            try (var entries = Files.newDirectoryStream(dirA)) {
                entries.forEach(p -> names.add(p.getFileName().toString()));
            }
            names.sort(null);
            List<String> other = new ArrayList<>();
            try (var entries = Files.newDirectoryStream(dirB)) {
                entries.forEach(p -> other.add(p.getFileName().toString()));
            }
            other.sort(null);
            assertEquals(names, other, "the files of arm " + (i + 1));
            for (String name : names) {
                byte[] left = Files.readAllBytes(dirA.resolve(name));
                byte[] right = Files.readAllBytes(dirB.resolve(name));
                if (name.endsWith(".json")) {
                    String l = new String(left, StandardCharsets.UTF_8);
                    assertTrue(l.contains("\"arm_id\" : \"" + idA + "\""), name + " names its arm " + idA);
                    left = l.replace("\"arm_id\" : \"" + idA + "\"", "\"arm_id\" : \"" + idB + "\"")
                            .getBytes(StandardCharsets.UTF_8);
                }
                assertArrayEquals(left, right, "arm " + (i + 1) + " " + name + " differs");
            }
        }
    }

    /** @return the binary file beside a replicate's JSON */
    public static Path binary(Path json) {
        String name = json.getFileName().toString();
        return json.resolveSibling(name.substring(0, name.length() - ".json".length()) + ".bin");
    }

    /** Copies a study directory tree: {@code to} gets every directory and file of {@code from}. */
    public static void copyTree(Path from, Path to) throws Exception {
        try (var walk = Files.walk(from)) {
            for (Path p : walk.toList()) {
                Path target = to.resolve(from.relativize(p).toString());
                if (Files.isDirectory(p)) {
                    Files.createDirectories(target);
                } else {
                    Files.copy(p, target);
                }
            }
        }
    }
}
