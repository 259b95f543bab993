package settle.reports.format;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.IntStream;
import settle.input.BadInputException;

/**
 * Reads a study directory through its format ({@link StudyFormat}): {@code manifest.json}, {@code plan.yaml},
 * {@code reference.json}, {@code encoding.json} (absent in a study written before settle recorded it), {@code arms/<arm>/<replicate>.json} and {@code nudges.csv}, each checked field by field by
 * its codec. A missing or invalid directory or file gives a {@link BadInputException} with a one-line message naming
 * the file and the key and what would be accepted; a missing replicate file is not an error (the study is partial and
 * its slot is null). A directory in format 1 is refused: its tail metrics and reshuffling prediction mean something
 * else, so none of its numbers is shown beside format 2's.
 */
public final class StudyReader {

    private StudyReader() {
    }

    /**
     * @param directory the study directory
     * @return the study
     * @throws BadInputException for a missing or invalid study directory or file
     * @throws IOException when a file exists but cannot be read
     */
    public static Study read(Path directory) throws IOException {
        if (!Files.isDirectory(directory)) {
            throw BadInputException.inFile(directory.toString(), "", Files.exists(directory)
                    ? "a file, not a study directory; expected the directory settle run made"
                    : "no such study directory");
        }
        Path manifestFile = directory.resolve(StudyFormat.MANIFEST);
        if (!Files.isRegularFile(manifestFile)) {
            throw BadInputException.inFile(directory.toString(), "", "not a study directory (no "
                    + StudyFormat.MANIFEST + "; a study directory is made by settle run)");
        }
        Manifest manifest = ManifestJson.read(Files.readAllBytes(manifestFile), manifestFile.toString(),
                StudyFormat.rerun(directory));
        Path planFile = directory.resolve(StudyFormat.PLAN);
        String planText;
        try {
            planText = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(
                    planFile))).toString();
        } catch (NoSuchFileException e) {
            throw BadInputException.inFile(planFile.toString(), "", "missing; every study directory has its resolved"
                    + " plan");
        } catch (CharacterCodingException e) {
            throw BadInputException.inFile(planFile.toString(), "", "not UTF-8 text; expected the resolved plan settle"
                    + " wrote");
        }
        Path referenceFile = directory.resolve(StudyFormat.REFERENCE);
        Reference reference = null;
        if (Files.isRegularFile(referenceFile)) {
            try {
                reference = ReferenceJson.read(Files.readAllBytes(referenceFile), referenceFile.toString(),
                        manifest.parameters(), manifest.arms());
            } catch (BadInputException e) {
                throw StudyFormat.damagedReference(directory, e);
            }
        } else if (manifest.reference().equals(StudyFormat.REFERENCE)) {
            throw BadInputException.inFile(referenceFile.toString(), "", "missing; the manifest records θ* of the"
                    + " convex model in it; " + StudyFormat.referenceRemedy(directory));
        }
        Path encodingFile = directory.resolve(StudyFormat.ENCODING);
        EncodingRecord encoding = null;
        if (Files.isRegularFile(encodingFile)) {
            try {
                encoding = EncodingJson.read(Files.readAllBytes(encodingFile), encodingFile.toString(), manifest);
            } catch (BadInputException e) {
                throw StudyFormat.damagedEncoding(directory, e);
            }
        }
        int arms = manifest.arms().size();
        int count = manifest.replicates();
        Replicate[] files = new Replicate[arms * count];
        boolean convex = reference != null;
        String remedy = "settle run " + directory.resolve(StudyFormat.PLAN) + " --out " + directory + " sets invalid"
                + " replicate files aside and trains them again";
        // Files are independent: read them in parallel; each lands in its own slot, so the order is fixed. The first
        // failure in file order is the one reported, whatever the threads did.
        RuntimeException[] failures = new RuntimeException[files.length];
        try {
            IntStream.range(0, files.length).parallel().forEach(i -> {
                int a = i / count + 1;
                int k = i % count + 1;
                String id = manifest.armIds().get(a - 1);
                Path file = StudyFormat.replicateFile(directory, id, k);
                if (!Files.isRegularFile(file)) {
                    return;
                }
                try {
                    ReplicateJson.Expected expected = new ReplicateJson.Expected(id, manifest.arms().get(a - 1), k,
                            manifest.rootSeed(), null, manifest.parameters(), manifest.classes(), manifest.testRows(),
                            manifest.updatesPerEpoch(), manifest.plannedUpdates(), convex);
                    files[i] = ReplicateJson.readFiles(file, expected);
                } catch (BadInputException e) {
                    failures[i] = BadInputException.at(e.file(), e.line(), e.column(), e.key(), e.detail() + "; "
                            + remedy);
                } catch (IOException e) {
                    failures[i] = new UncheckedIOException(e);
                }
            });
        } catch (UncheckedIOException e) {
            throw e.getCause();
        }
        for (RuntimeException failure : failures) {
            if (failure instanceof UncheckedIOException io) {
                throw io.getCause();
            }
            if (failure != null) {
                throw failure;
            }
        }
        List<List<Replicate>> replicates = new ArrayList<>();
        for (int a = 0; a < arms; a++) {
            replicates.add(Arrays.asList(Arrays.copyOfRange(files, a * count, (a + 1) * count)));
        }
        return new Study(directory, manifest, planText, reference, encoding, replicates, NudgesCsv.read(directory));
    }
}
