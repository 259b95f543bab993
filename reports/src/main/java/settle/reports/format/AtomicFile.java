package settle.reports.format;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;

/**
 * The one way settle writes a file of a study directory (and every other file it writes whole): the bytes go to a
 * temporary file beside the target, are forced to disk, and the temporary file is renamed over the target. A reader,
 * or a process killed at any moment, sees the old content or the whole new content, never a part.
 *
 * <p>Temporary files are named {@code .<target>.<pid>.<n>.partial}: hidden, unique per process and write, and known
 * to {@link #removeLeftovers}, which deletes those whose process is no longer alive (never a live writer's). A process
 * stopped by a signal that lets the JVM run its shutdown hooks (Ctrl-C, {@code kill}) deletes its own temporary files
 * on the way out; one killed outright (SIGKILL, a power cut) leaves them to the next {@code settle run} or
 * {@code settle report} on that directory.
 *
 * <p>Files are created with the process's default permissions (0644 under the usual umask 022), like every other
 * file settle writes; {@link Files#createTempFile} would make them 0600.
 */
public final class AtomicFile {

    /** The suffix of a temporary file. */
    public static final String TEMP_SUFFIX = ".partial";

    private static final AtomicLong COUNTER = new AtomicLong();
    private static final long PID = ProcessHandle.current().pid();
    /** Temporary files this process is writing now; a shutdown hook deletes them. */
    private static final Set<Path> IN_FLIGHT = ConcurrentHashMap.newKeySet();

    static {
        Thread cleaner = new Thread(() -> {
            for (Path p : IN_FLIGHT) {
                try {
                    Files.deleteIfExists(p);
                } catch (IOException | RuntimeException e) {
                    // shutting down: a file left here is removed by the next run or report
                }
            }
        }, "settle-temp-cleaner");
        Runtime.getRuntime().addShutdownHook(cleaner);
    }

    private AtomicFile() {
    }

    /** Writes a file's content to a stream. */
    @FunctionalInterface
    public interface Content {
        /** @param out where the content goes (buffered; not to be closed) */
        void writeTo(OutputStream out) throws IOException;
    }

    /** Writes {@code bytes} to {@code target} atomically, creating parent directories as needed. */
    public static void write(Path target, byte[] bytes) throws IOException {
        write(target, out -> out.write(bytes));
    }

    /** Writes {@code text} as UTF-8 to {@code target} atomically. */
    public static void write(Path target, String text) throws IOException {
        write(target, text.getBytes(StandardCharsets.UTF_8));
    }

    /**
     * Writes what {@code content} produces to {@code target} atomically, creating parent directories as needed.
     *
     * @throws IOException when the file cannot be written (the target is then unchanged and no temporary file is
     *     left)
     */
    public static void write(Path target, Content content) throws IOException {
        try {
            writeOrFail(target, content);
        } catch (IOException e) {
            throw new IOException("cannot write " + target + ": " + reason(e), e);
        }
    }

    /** @return why a file could not be written, in words (the JDK names only the path for some failures) */
    private static String reason(IOException e) {
        if (e instanceof java.nio.file.DirectoryNotEmptyException) {
            return "it is a directory that is not empty";
        }
        if (e instanceof java.nio.file.AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof java.nio.file.FileSystemException f && f.getReason() != null) {
            return f.getReason();
        }
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }

    private static void writeOrFail(Path target, Content content) throws IOException {
        Path dir = target.toAbsolutePath().getParent();
        Files.createDirectories(dir);
        Path temp = dir.resolve(tempName(target.getFileName().toString()));
        IN_FLIGHT.add(temp);
        try {
            try (FileChannel ch = FileChannel.open(temp, StandardOpenOption.WRITE, StandardOpenOption.CREATE_NEW)) {
                OutputStream out = new java.io.BufferedOutputStream(Channels.newOutputStream(ch), 1 << 16);
                content.writeTo(out);
                out.flush();
                ch.force(true);
            }
            try {
                Files.move(temp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(temp, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            try {
                Files.deleteIfExists(temp);
            } finally {
                IN_FLIGHT.remove(temp);
            }
        }
    }

    /** @return the name of a new temporary file for a target named {@code name} */
    private static String tempName(String name) {
        return "." + name + "." + PID + "." + COUNTER.incrementAndGet() + TEMP_SUFFIX;
    }

    /** @return true when {@code name} is the name of one of these temporary files */
    public static boolean isTemporary(String name) {
        return owner(name) >= 0;
    }

    /** @return the pid in a temporary file's name, or −1 when the name is not one */
    private static long owner(String name) {
        if (!name.startsWith(".") || !name.endsWith(TEMP_SUFFIX)) {
            return -1;
        }
        String stem = name.substring(0, name.length() - TEMP_SUFFIX.length());
        int counter = stem.lastIndexOf('.');
        int pid = counter > 0 ? stem.lastIndexOf('.', counter - 1) : -1;
        if (pid <= 0) {
            return -1;
        }
        try {
            Long.parseLong(stem.substring(counter + 1));
            return Long.parseLong(stem.substring(pid + 1, counter));
        } catch (NumberFormatException e) {
            return -1;
        }
    }

    /**
     * Removes the temporary files that writers which are no longer alive left in {@code dir} (not recursive).
     *
     * @return how many were removed
     */
    public static int removeLeftovers(Path dir) throws IOException {
        if (!Files.isDirectory(dir)) {
            return 0;
        }
        int removed = 0;
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(dir, "*" + TEMP_SUFFIX)) {
            for (Path p : entries) {
                long pid = owner(p.getFileName().toString());
                if (pid < 0 || pid == PID || ProcessHandle.of(pid).map(ProcessHandle::isAlive).orElse(false)) {
                    continue;
                }
                try {
                    if (Files.deleteIfExists(p)) {
                        removed++;
                    }
                } catch (NoSuchFileException e) {
                    // removed by someone else meanwhile
                }
            }
        }
        return removed;
    }
}
