package settle.experiments.study;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import settle.datasets.Dataset;

/** SHA-256 fingerprints of what a study depends on, for the manifest and for refusing a changed plan. */
final class Hashes {

    private Hashes() {
    }

    static MessageDigest sha256() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("this JVM has no SHA-256", e);
        }
    }

    static String hex(MessageDigest digest) {
        return HexFormat.of().formatHex(digest.digest());
    }

    /** Feeds a dataset's names, values (IEEE bits) and labels, in row order, into {@code digest}. */
    static void feed(MessageDigest digest, Dataset data) {
        for (String name : data.featureNames()) {
            text(digest, name);
        }
        for (String name : data.classNames()) {
            text(digest, name);
        }
        ByteBuffer row = ByteBuffer.allocate(8 * data.features() + 4);
        for (int i = 0; i < data.rows(); i++) {
            row.clear();
            for (int j = 0; j < data.features(); j++) {
                row.putLong(Double.doubleToLongBits(data.feature(i, j)));
            }
            row.putInt(data.label(i));
            digest.update(row.array(), 0, row.position());
        }
    }

    static void text(MessageDigest digest, String s) {
        byte[] bytes = s.getBytes(StandardCharsets.UTF_8);
        digest.update(ByteBuffer.allocate(4).putInt(bytes.length).array());
        digest.update(bytes);
    }

    /** @return the SHA-256 of one dataset */
    static String of(Dataset data) {
        MessageDigest d = sha256();
        feed(d, data);
        return hex(d);
    }
}
