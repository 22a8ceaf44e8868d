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
            return text.getBytes(StandardCharsets.UTF_8);
        } catch (IOException e) {
            s.error(key, file, "a readable file holding the " + what + " (" + p + ": " + reason(e) + ")");
            return null;
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
