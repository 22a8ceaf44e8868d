package wayward.delivery;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * A certificate authority made for one test with Debian's openssl: a CA certificate and a server certificate
 * for localhost / 127.0.0.1 signed by it, as PEM files, plus the server's key and certificate as PKCS#12.
 */
public final class TestCa {
    public final Path caPem;
    public final Path serverPem;
    public final Path serverKey;
    public final Path serverP12;
    public static final String P12_PASSWORD = "yard-test";

    public TestCa(Path dir) throws IOException, InterruptedException {
        Files.createDirectories(dir);
        caPem = dir.resolve("ca.pem");
        serverPem = dir.resolve("server.pem");
        serverKey = dir.resolve("server.key");
        serverP12 = dir.resolve("server.p12");
        Path caKey = dir.resolve("ca.key");
        Path csr = dir.resolve("server.csr");
        Path ext = dir.resolve("server.ext");
        Files.writeString(ext, "subjectAltName=DNS:localhost,IP:127.0.0.1\nbasicConstraints=CA:FALSE\n"
                + "extendedKeyUsage=serverAuth\n");
        run(dir, "openssl", "req", "-x509", "-newkey", "rsa:2048", "-nodes", "-keyout", caKey.toString(), "-out",
                caPem.toString(), "-days", "2", "-subj", "/CN=Yard Test CA",
                "-addext", "basicConstraints=critical,CA:TRUE", "-addext", "keyUsage=critical,keyCertSign,cRLSign");
        run(dir, "openssl", "req", "-newkey", "rsa:2048", "-nodes", "-keyout", serverKey.toString(), "-out",
                csr.toString(), "-subj", "/CN=localhost");
        run(dir, "openssl", "x509", "-req", "-in", csr.toString(), "-CA", caPem.toString(), "-CAkey",
                caKey.toString(), "-CAcreateserial", "-out", serverPem.toString(), "-days", "2", "-extfile",
                ext.toString());
        run(dir, "openssl", "pkcs12", "-export", "-in", serverPem.toString(), "-inkey", serverKey.toString(),
                "-out", serverP12.toString(), "-passout", "pass:" + P12_PASSWORD);
    }

    private static void run(Path dir, String... cmd) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(List.of(cmd)).directory(dir.toFile()).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        if (!p.waitFor(60, TimeUnit.SECONDS) || p.exitValue() != 0) {
            throw new IOException(String.join(" ", cmd) + " failed: " + out);
        }
    }
}
