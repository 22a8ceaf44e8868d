package wayward.config;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.security.cert.CertificateException;
import java.security.cert.CertificateFactory;

/**
 * Reads the files a config names: secrets (token, password, signing secret) and PEM files of CA certificates.
 * Paths resolve against the config file's folder; a problem is reported on the key that named the file.
 */
final class ReferencedFiles {
    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(ConfigLoader.class);

    private ReferencedFiles() {
    }

    /** The content of a secret file without a trailing line break, or null after reporting. */
    static byte[] secret(TableReader s, Path base, String key, String file, String what) {
        Path p = base.resolve(file).normalize();
        try {
            String text = Files.readString(p).replaceAll("[\\r\\n]+$", "");
            if (text.isEmpty()) {
                s.error(key, file, "a file holding a non-empty " + what + " (" + p + " is empty)");
                return null;
            }
            warnIfOthersRead(p, what);
            return text.getBytes(StandardCharsets.UTF_8);
        } catch (IOException e) {
            s.error(key, file, "a readable file holding the " + what + " (" + p + ": " + reason(e) + ")");
            return null;
        }
    }

    /** Warns, as ssh does for keys, when users other than the owner may read a secret (POSIX file systems). */
    private static void warnIfOthersRead(Path p, String what) {
        try {
            java.util.Set<java.nio.file.attribute.PosixFilePermission> perms = Files.getPosixFilePermissions(p);
            if (perms.contains(java.nio.file.attribute.PosixFilePermission.GROUP_READ)
                    || perms.contains(java.nio.file.attribute.PosixFilePermission.OTHERS_READ)) {
                LOG.warn("{} file {} can be read by other users (mode {}); make it readable by the service's user"
                        + " only: chmod 600 {}", what, p,
                        java.nio.file.attribute.PosixFilePermissions.toString(perms), p);
            }
        } catch (UnsupportedOperationException | IOException e) {
            // not a POSIX file system: nothing to say
        }
    }

    /** The optional {@code ca_file}: a readable PEM file with at least one certificate; resolved path or null. */
    static String caFile(TableReader s, Path base, boolean tls) {
        String caFile = s.string("ca_file", null, "a PEM file of CA certificates");
        if (caFile == null) {
            return null;
        }
        if (!tls) {
            s.error("ca_file", caFile, "only with an https:// or mqtts:// url");
            return null;
        }
        Path p = base.resolve(caFile).normalize();
        try (InputStream in = Files.newInputStream(p)) {
            if (CertificateFactory.getInstance("X.509").generateCertificates(in).isEmpty()) {
                s.error("ca_file", caFile, "a PEM file of CA certificates (" + p + " holds none)");
                return null;
            }
        } catch (IOException e) {
            s.error("ca_file", caFile, "a readable PEM file of CA certificates (" + p + ": " + reason(e) + ")");
            return null;
        } catch (CertificateException e) {
            s.error("ca_file", caFile, "a PEM file of CA certificates (" + p + ": " + e.getMessage() + ")");
            return null;
        }
        return p.toString();
    }

    private static String reason(IOException e) {
        return e instanceof NoSuchFileException ? "not found" : e.getMessage();
    }
}
