package settle.experiments.study;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.concurrent.atomic.AtomicLong;

/**
 * Writes files so that a reader, or a run killed at any moment, sees either the old content or the whole
 * new content, never a part: the bytes go to a temporary file in the same directory, are forced to disk,
 * and the temporary file is renamed over the target.
 */
public final class AtomicFiles {

    /** Suffix of the temporary files; a killed run may leave some behind, which the next run removes. */
    public static final String TEMP_SUFFIX = ".partial";

    private static final AtomicLong COUNTER = new AtomicLong();

    private AtomicFiles() {
    }

    /** Writes {@code bytes} to {@code target} atomically, creating parent directories as needed. */
    public static void write(Path target, byte[] bytes) throws IOException {
        Path dir = target.toAbsolutePath().getParent();
        Files.createDirectories(dir);
        // a name no other writer uses; created with the default permissions (createTempFile would make it 0600)
        Path temp = dir.resolve("." + target.getFileName() + "." + ProcessHandle.current().pid() + "."
                + Thread.currentThread().getId() + "." + COUNTER.incrementAndGet() + TEMP_SUFFIX);
        try {
            try (FileChannel ch = FileChannel.open(temp, StandardOpenOption.WRITE, StandardOpenOption.CREATE_NEW)) {
                java.nio.ByteBuffer buffer = java.nio.ByteBuffer.wrap(bytes);
                while (buffer.hasRemaining()) {
                    ch.write(buffer);
                }
                ch.force(true);
            }
            try {
                Files.move(temp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(temp, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(temp);
        }
    }

    /** Writes {@code text} as UTF-8 to {@code target} atomically. */
    public static void write(Path target, String text) throws IOException {
        write(target, text.getBytes(StandardCharsets.UTF_8));
    }

    /** Removes temporary files a killed writer left in {@code dir} (not recursive); returns how many. */
    public static int removeLeftovers(Path dir) throws IOException {
        if (!Files.isDirectory(dir)) {
            return 0;
        }
        int removed = 0;
        try (var entries = Files.newDirectoryStream(dir, "*" + TEMP_SUFFIX)) {
            for (Path p : entries) {
                Files.deleteIfExists(p);
                removed++;
            }
        }
        return removed;
    }
}
