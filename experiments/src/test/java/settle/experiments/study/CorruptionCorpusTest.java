package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.UnaryOperator;
import java.util.zip.CRC32C;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;

/**
 * The corruption corpus: one replicate of a finished study (its JSON file or its binary file) damaged in each way a
 * disk, a copy or a hand can damage it. {@code settle report} refuses each with exit 2 and one line naming the file and the field (and what to
 * do); {@code settle run} on the same plan sets the file aside under a quarantine name (its bytes kept), names it on
 * stderr, trains the replicate again, and ends with exactly the file an uninterrupted run wrote. No damaged file
 * reaches the verdict.
 */
class CorruptionCorpusTest {

    @TempDir
    static Path dir;

    private static Path plan;
    private static Path original;

    /** @return the damaged file: replicate 2 of arm 3 */
    private static Path damaged(Path study) throws Exception {
        return StudyFiles.arm(study, 3).resolve("2.json");
    }

    @BeforeAll
    static void aFinishedStudy() throws Exception {
        plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("corpus", 3, ""));
        original = dir.resolve("original");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                original.toString(), "--quiet", "--threads", "1"));
    }

    /**
     * One way to damage a replicate.
     *
     * @param name what the damage is
     * @param file the file damaged: "2.json", or "2.bin" (the replicate's binary file)
     * @param damage the damaged bytes from the whole file's (null: the file is deleted)
     * @param consistent for the binary file: its checksum, and the length and checksum the JSON records, are made to
     *     match the damaged bytes, so that the check of the values themselves must catch it
     * @param named the file the refusal names: "2.json" or "2.bin"
     * @param problem what the refusal says after the file's name (and before what to do)
     */
    private record Damage(String name, String file, UnaryOperator<byte[]> damage, boolean consistent, String named,
            String problem) {
        Damage(String name, UnaryOperator<byte[]> damage, String problem) {
            this(name, "2.json", damage, false, "2.json", problem);
        }
    }

    private static UnaryOperator<byte[]> text(UnaryOperator<String> edit) {
        return b -> edit.apply(new String(b, StandardCharsets.UTF_8)).getBytes(StandardCharsets.UTF_8);
    }

    /** @return the byte offset of the values of block {@code name} in a binary file (layout as in the README) */
    private static int blockOffset(byte[] bin, String name) {
        ByteBuffer in = ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN);
        int count = in.getInt(12);
        int offset = 16 + 48 * count;
        for (int i = 0; i < count; i++) {
            String n = new String(bin, 16 + 48 * i, 32, StandardCharsets.US_ASCII).replace("\0", "");
            if (n.equals(name)) {
                return offset;
            }
            offset += in.getInt(16 + 48 * i + 44);
        }
        throw new AssertionError("no block " + name);
    }

    /** @return the binary file with its trailing CRC-32C made to match its other bytes */
    private static byte[] sealed(byte[] bin) {
        CRC32C crc = new CRC32C();
        crc.update(bin, 0, bin.length - 4);
        ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN).putInt(bin.length - 4, (int) crc.getValue());
        return bin;
    }

    private static List<Damage> corpus() throws Exception {
        byte[] other = Files.readAllBytes(StudyFiles.arm(original, 3).resolve("1.json"));
        byte[] otherBinary = Files.readAllBytes(StudyFiles.arm(original, 3).resolve("1.bin"));
        return List.of(
                new Damage("truncated", b -> Arrays.copyOf(b, b.length / 2), ":NUMBERS: not valid JSON: the file ends in"
                        + " the middle of a value (it was cut short)"),
                new Damage("NUL bytes", b -> {
                    byte[] c = b.clone();
                    Arrays.fill(c, 200, 260, (byte) 0);
                    return c;
                }, ":NUMBERS: not valid JSON: it holds a control character (a NUL byte) where JSON allows none"),
                new Damage("empty", b -> new byte[0], ": the file is empty; expected a JSON object"),
                new Damage("another replicate's content", b -> other.clone(), ": replicate: the file holds arm ARMID"
                        + " replicate 1; its path says arm ARMID replicate 2"),
                new Damage("a missing field", text(s -> s.replaceFirst("\"final_gap\" : [^,]*,\\s*", "")),
                        ": metrics.final_gap: missing; every 'metrics' has it"),
                new Damage("the metrics deleted", text(s -> s.replaceFirst("\"metrics\" : \\{[^}]*\\},\\s*", "")),
                        ": metrics: missing; every file of this kind has it"),
                new Damage("a wrong type", text(s -> s.replaceFirst("\"final_gap\" : [^,]*,", "\"final_gap\" : \"small\",")),
                        ": metrics.final_gap: must be a number, not the text 'small'"),
                new Damage("an out-of-range value", text(s -> s.replaceFirst("\"tail_radius\" : [^,]*,",
                        "\"tail_radius\" : -5.0,")), ": metrics.tail_radius: must be a number ≥ 0 or null, not -5.0"),
                new Damage("a wrong replicate index", text(s -> s.replaceFirst("\"replicate\" : 2,", "\"replicate\" : 9,")),
                        ": replicate: the file holds arm ARMID replicate 9; its path says arm ARMID replicate 2"),
                new Damage("a wrong format version", text(s -> s.replaceFirst("\"format\" : 4,", "\"format\" : 1,")),
                        ": format: this file is in format 1; this settle reads format 4"),
                new Damage("the binary file missing", "2.bin", null, false, "2.bin", ": missing; the replicate's JSON"
                        + " records a binary file of NUMBER bytes beside it"),
                new Damage("the binary file truncated", "2.bin", b -> Arrays.copyOf(b, b.length / 2), false, "2.bin",
                        ": holds NUMBER bytes with CRC-32C HEX; the replicate's JSON records NUMBER bytes with HEX (the"
                        + " two files are not one replicate's)"),
                new Damage("one bit of the binary file flipped", "2.bin", b -> {
                    byte[] c = b.clone();
                    c[c.length / 2] ^= 4;
                    return c;
                }, false, "2.bin", ": holds NUMBER bytes with CRC-32C HEX; the replicate's JSON records NUMBER bytes"
                        + " with HEX (the two files are not one replicate's)"),
                new Damage("another replicate's binary file", "2.bin", b -> otherBinary.clone(), false, "2.bin",
                        ": holds NUMBER bytes with CRC-32C HEX; the replicate's JSON records NUMBER bytes with HEX (the"
                        + " two files are not one replicate's)"),
                new Damage("a binary file whose stored checksum is wrong", "2.bin", b -> {
                    byte[] c = b.clone();
                    c[c.length / 2] ^= 4;
                    return c;
                }, true, "2.bin", ": its CRC-32C is HEX but it records HEX: the file is damaged"),
                new Damage("a binary file in another format", "2.bin", b -> {
                    byte[] c = b.clone();
                    ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN).putInt(8, 2);
                    return sealed(c);
                }, true, "2.bin", ": format: this file is in format 2; this settle reads format 4"),
                new Damage("a probability row that does not sum to 1", "2.bin", b -> {
                    byte[] c = b.clone();
                    ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN).putFloat(blockOffset(c,
                            "test_probabilities.values"), 0.75f);
                    return sealed(c);
                }, true, "2.json", ": test_probabilities.values: row 1 sums to NUMBER; each row of class probabilities"
                        + " sums to 1"),
                new Damage("a vector of the wrong length", "2.bin", b -> {
                    // θ_T's block loses its first value: its column count says 3 and the rest moves up 8 bytes
                    ByteBuffer in = ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN);
                    int at = blockOffset(b, "last");
                    byte[] c = new byte[b.length - 8];
                    System.arraycopy(b, 0, c, 0, at);
                    System.arraycopy(b, at + 8, c, at, b.length - at - 8);
                    for (int i = 0; i < in.getInt(12); i++) {
                        if (new String(b, 16 + 48 * i, 32, StandardCharsets.US_ASCII).startsWith("last\0")) {
                            ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 48 * i + 36, 3)
                                    .putInt(16 + 48 * i + 44, 24);
                        }
                    }
                    return sealed(c);
                }, true, "2.json", ": last: holds 3 values; expected 4"),
                new Damage("a vector written as a matrix", "2.bin", b -> {
                    // θ_T's 4 values, the same bytes, but the table says 2 rows of 2
                    byte[] c = b.clone();
                    for (int i = 0; i < ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN).getInt(12); i++) {
                        if (new String(b, 16 + 48 * i, 32, StandardCharsets.US_ASCII).startsWith("last\0")) {
                            ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 48 * i + 32, 2)
                                    .putInt(16 + 48 * i + 36, 2);
                        }
                    }
                    return sealed(c);
                }, true, "2.bin", ": last: is 2 × 2; a vector is written as 1 row"),
                new Damage("a predicted class that is not the most probable", "2.bin", b -> {
                    // row 1's stored class moves to the other column of the two: its probability is the smaller
                    byte[] c = b.clone();
                    ByteBuffer in = ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN);
                    int p = blockOffset(c, "test_probabilities.values");
                    int best = in.getFloat(p) >= in.getFloat(p + 4) ? 0 : 1;
                    c[blockOffset(c, "test_probabilities.classes")] = (byte) (1 - best);
                    return sealed(c);
                }, true, "2.json", ": test_probabilities.classes: row 1 predicts class NUMBER, but class NUMBER is"
                        + " more probable in test_probabilities.values; the predicted class is the most probable"),
                new Damage("θ_T in a lossy coding", "2.bin", b -> {
                    byte[] c = b.clone();
                    for (int i = 0; i < ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN).getInt(12); i++) {
                        if (new String(b, 16 + 48 * i, 32, StandardCharsets.US_ASCII).startsWith("last\0")) {
                            // float32 of 4 values would be 16 bytes: the table says so, the file is cut to fit
                            ByteBuffer.wrap(c).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 48 * i + 40, 3);
                        }
                    }
                    int at = blockOffset(b, "last");
                    byte[] d = new byte[c.length - 16];
                    System.arraycopy(c, 0, d, 0, at + 16);
                    System.arraycopy(c, at + 32, d, at + 16, c.length - at - 32);
                    for (int i = 0; i < ByteBuffer.wrap(b).order(ByteOrder.LITTLE_ENDIAN).getInt(12); i++) {
                        if (new String(b, 16 + 48 * i, 32, StandardCharsets.US_ASCII).startsWith("last\0")) {
                            ByteBuffer.wrap(d).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 48 * i + 44, 16);
                        }
                    }
                    return sealed(d);
                }, true, "2.bin", ": last: is in float32; this array is written in float64 or float64-xor"));
    }

    /** @return the problem as a pattern's text: NUMBERS stands for a line and column, NUMBER for a number */
    private static boolean matches(String expected, String actual) {
        String regex = java.util.regex.Pattern.quote(expected).replace("NUMBERS", "\\E[0-9]+:[0-9]+\\Q")
                .replace("ARMID", "\\E'[A-Za-z0-9_.-]+-[0-9a-f]{12}'\\Q")
                .replace("NUMBER", "\\E[0-9.E-]+\\Q")
                .replace("HEX", "\\E[0-9a-f']{8,10}\\Q");
        return actual.matches(regex);
    }

    @TestFactory
    List<DynamicTest> reportRefusesByNameAndRunTrainsAgain() throws Exception {
        Path wholeJson = damaged(original);
        byte[] whole = Files.readAllBytes(wholeJson);
        byte[] wholeBinary = Files.readAllBytes(StudyFiles.binary(wholeJson));
        List<DynamicTest> tests = new ArrayList<>();
        int i = 0;
        for (Damage d : corpus()) {
            Path study = dir.resolve("case-" + i++);
            tests.add(DynamicTest.dynamicTest(d.name(), () -> {
                StudyFiles.copyTree(original, study);
                Path json = damaged(study);
                Path binary = StudyFiles.binary(json);
                Path file = json.resolveSibling(d.file());
                byte[] before = Files.readAllBytes(file);
                byte[] damaged = d.damage() == null ? null : d.damage().apply(before);
                if (damaged == null) {
                    Files.delete(file);
                } else {
                    assertFalse(Arrays.equals(before, damaged), "the damage changes the file");
                    Files.write(file, damaged);
                }
                if (d.consistent()) {
                    CRC32C crc = new CRC32C();
                    crc.update(damaged, 0, damaged.length - 4);
                    Files.writeString(json, Files.readString(json).replaceFirst("\"bytes\" : [0-9]+", "\"bytes\" : "
                            + damaged.length).replaceFirst("\"crc32c\" : \"[0-9a-f]+\"", "\"crc32c\" : \""
                            + String.format("%08x", crc.getValue()) + "\""));
                }
                byte[] damagedJson = Files.readAllBytes(json);
                Path named = json.resolveSibling(d.named());

                StringWriter err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()), d.name());
                String line = err.toString().strip();
                assertEquals(-1, line.indexOf('\n'), "one line: " + line);
                String remedy = "; settle run " + study.resolve("plan.yaml") + " --out " + study + " sets invalid"
                        + " replicate files aside and trains them again";
                assertTrue(line.startsWith(named.toString()) && line.endsWith(remedy), line);
                String problem = line.substring(named.toString().length(), line.length() - remedy.length());
                assertTrue(matches(d.problem(), problem), "expected " + d.problem() + ", said " + problem);

                boolean binaryLeft = Files.exists(binary);
                err = new StringWriter();
                assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                        study.toString(), "--quiet"), err.toString());
                assertEquals("settle run: " + line.substring(0, line.length() - remedy.length()) + "; moved aside to"
                        + " 2.json.quarantined-1" + (binaryLeft ? " (with 2.bin.quarantined-1)" : "")
                        + " and trained again", err.toString().strip());
                assertArrayEquals(whole, Files.readAllBytes(json), "trained again, byte for byte");
                assertArrayEquals(wholeBinary, Files.readAllBytes(binary), "its binary file too");
                assertArrayEquals(damagedJson, Files.readAllBytes(json.resolveSibling("2.json.quarantined-1")),
                        "the damaged file is kept aside, never deleted");
                if (binaryLeft) {
                    assertArrayEquals(d.file().equals("2.bin") ? damaged : wholeBinary,
                            Files.readAllBytes(json.resolveSibling("2.bin.quarantined-1")), "its binary file beside it");
                }
                assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "report",
                        study.toString()), "the report reads the study again");
            }));
        }
        return tests;
    }

    /** The files of a study, by path relative to it, with their bytes. */
    private static java.util.Map<String, byte[]> files(Path study) throws Exception {
        java.util.Map<String, byte[]> out = new java.util.TreeMap<>();
        try (java.util.stream.Stream<Path> walk = Files.walk(study)) {
            for (Path p : walk.filter(Files::isRegularFile).toList()) {
                out.put(study.relativize(p).toString(), Files.readAllBytes(p));
            }
        }
        return out;
    }

    /**
     * A damaged or deleted reference.json: the report refuses it with one line naming the file and the field and, as
     * for a damaged encoding.json, what to do (θ* and its curvature are computed from the plan and the data); the next run
     * writes it again, byte for byte as before, trains nothing and keeps every replicate file as it was.
     */
    @TestFactory
    List<DynamicTest> aDamagedReferenceIsRefusedWithTheRemedyAndWrittenAgainByTheNextRun() throws Exception {
        byte[] whole = Files.readAllBytes(original.resolve("reference.json"));
        String text = new String(whole, StandardCharsets.UTF_8);
        record Broken(String name, UnaryOperator<String> damage, String problem) {
        }
        List<Broken> cases = List.of(
                new Broken("truncated", s -> s.substring(0, s.length() / 2), ":NUMBERS: not valid JSON: the file ends"
                        + " in the middle of a value (it was cut short)"),
                new Broken("a wrong type", s -> s.replaceFirst("\"objective\" : [^,]*,", "\"objective\" : \"low\","),
                        ": objective: must be a number ≥ 0, not the text 'low'"),
                new Broken("a field deleted", s -> s.replaceFirst("\"gradient_norm\" : [^,]*,\\s*", ""),
                        ": gradient_norm: missing; every file of this kind has it"),
                new Broken("deleted", s -> null, ": missing; the manifest records θ* of the convex model in it"));
        List<DynamicTest> tests = new ArrayList<>();
        int i = 0;
        for (Broken b : cases) {
            Path study = dir.resolve("reference-" + i++);
            tests.add(DynamicTest.dynamicTest(b.name(), () -> {
                StudyFiles.copyTree(original, study);
                Path file = study.resolve("reference.json");
                String damaged = b.damage().apply(text);
                if (damaged == null) {
                    Files.delete(file);
                } else {
                    assertFalse(damaged.equals(text), "the damage changes the file");
                    Files.writeString(file, damaged);
                }
                java.util.Map<String, byte[]> before = files(study);

                StringWriter err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()));
                String line = err.toString().strip();
                assertEquals(-1, line.indexOf('\n'), "one line: " + line);
                String remedy = "; it is computed from the plan and the data: settle run " + study.resolve("plan.yaml")
                        + " --out " + study + " writes it again, keeping the finished replicates";
                assertTrue(line.startsWith(file.toString()) && line.endsWith(remedy), line);
                String problem = line.substring(file.toString().length(), line.length() - remedy.length());
                assertTrue(matches(b.problem(), problem), "expected " + b.problem() + ", said " + problem);
                java.util.Map<String, byte[]> after = files(study);
                assertEquals(before.keySet(), after.keySet(), "the refused report writes nothing");

                // as the line says: the run writes the file again and trains nothing
                StringWriter out = new StringWriter();
                err = new StringWriter();
                assertEquals(0, StudyRunnerTest.settle(out, err, "run", study.resolve("plan.yaml").toString(), "--out",
                        study.toString(), "--quiet", "--json"), err.toString());
                assertEquals(0, new com.fasterxml.jackson.databind.ObjectMapper().readTree(out.toString())
                        .path("trained_now").asInt(-1), out.toString());
                assertArrayEquals(whole, Files.readAllBytes(file), "θ* and its curvature again, byte for byte");
                for (java.util.Map.Entry<String, byte[]> e : before.entrySet()) {
                    if (e.getKey().startsWith("arms")) {
                        assertArrayEquals(e.getValue(), Files.readAllBytes(study.resolve(e.getKey())), e.getKey());
                    }
                }
                assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "report",
                        study.toString()), "the report reads the study again");
            }));
        }
        return tests;
    }
}
