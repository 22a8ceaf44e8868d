package wayward.delivery;

import io.netty.handler.ssl.SslContext;
import io.netty.handler.ssl.SslContextBuilder;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.GeneralSecurityException;
import java.security.KeyStore;
import java.security.MessageDigest;
import java.security.cert.Certificate;
import java.security.cert.CertificateFactory;
import java.security.cert.X509Certificate;
import java.util.Collection;
import java.util.HexFormat;
import javax.net.ssl.TrustManager;
import javax.net.ssl.TrustManagerFactory;
import javax.net.ssl.X509TrustManager;

/** TLS client set-up shared by the webhook and MQTT clients: the JDK's trust store plus an optional CA file. */
final class TlsTrust {
    private TlsTrust() {
    }

    /**
     * A client context that checks the server's certificate chain and host name (HTTPS rules, RFC 2818) against
     * the JDK's trusted authorities and, when {@code caFile} is given, the PEM certificates in it.
     */
    static SslContext clientContext(String caFile, String shownUrl) {
        try {
            SslContextBuilder b = SslContextBuilder.forClient().endpointIdentificationAlgorithm("HTTPS");
            if (caFile != null) {
                b.trustManager(trustWithExtra(Path.of(caFile)));
            }
            return b.build();
        } catch (IOException | GeneralSecurityException e) {
            throw new IllegalStateException("TLS set-up for " + shownUrl + " failed: " + e.getMessage(), e);
        }
    }

    private static TrustManagerFactory trustWithExtra(Path caFile) throws IOException, GeneralSecurityException {
        KeyStore store = KeyStore.getInstance(KeyStore.getDefaultType());
        store.load(null, null);
        TrustManagerFactory jdk = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
        jdk.init((KeyStore) null);
        int n = 0;
        for (TrustManager tm : jdk.getTrustManagers()) {
            if (tm instanceof X509TrustManager x) {
                for (X509Certificate c : x.getAcceptedIssuers()) {
                    store.setCertificateEntry("jdk-" + n++, c);
                }
            }
        }
        Collection<? extends Certificate> extra;
        try (InputStream in = Files.newInputStream(caFile)) {
            extra = CertificateFactory.getInstance("X.509").generateCertificates(in);
        }
        if (extra.isEmpty()) {
            throw new GeneralSecurityException(caFile + " holds no PEM certificate");
        }
        for (Certificate c : extra) {
            store.setCertificateEntry("extra-" + n++, c);
        }
        TrustManagerFactory f = TrustManagerFactory.getInstance(TrustManagerFactory.getDefaultAlgorithm());
        f.init(store);
        return f;
    }

    /** First 12 hex digits of the SHA-256 of {@code text}: a stable, file-name-safe key. */
    static String shortHash(String text) {
        try {
            byte[] d = MessageDigest.getInstance("SHA-256").digest(text.getBytes(StandardCharsets.UTF_8));
            return HexFormat.of().formatHex(d, 0, 6);
        } catch (GeneralSecurityException e) {
            throw new IllegalStateException(e);
        }
    }
}
