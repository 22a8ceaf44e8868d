package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.sun.net.httpserver.HttpsConfigurator;
import com.sun.net.httpserver.HttpsServer;
import java.io.InputStream;
import java.net.InetSocketAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.KeyStore;
import java.time.Instant;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import javax.net.ssl.KeyManagerFactory;
import javax.net.ssl.SSLContext;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventKind;

/**
 * HTTPS webhooks against the JDK's own HTTPS server with a certificate from a CA made by openssl for this
 * test: trusted through {@code ca_file}, refused (and retried) without it, and refused for a host name the
 * certificate does not name (RFC 2818 host name check).
 */
@Timeout(value = 60, unit = TimeUnit.SECONDS)
class WebhookTlsIT {
    private static final Event EVENT = new Event("tls-1", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
            Event.Phase.START, 12.3, Instant.parse("2026-12-02T10:00:00Z"), 180, 45, 0.04, Double.NaN);

    @Test
    void extraCaFileIsTrustedAndNothingElse(@TempDir Path dir) throws Exception {
        TestCa ca = new TestCa(dir.resolve("ca"));
        KeyStore ks = KeyStore.getInstance("PKCS12");
        try (InputStream in = Files.newInputStream(ca.serverP12)) {
            ks.load(in, TestCa.P12_PASSWORD.toCharArray());
        }
        KeyManagerFactory kmf = KeyManagerFactory.getInstance(KeyManagerFactory.getDefaultAlgorithm());
        kmf.init(ks, TestCa.P12_PASSWORD.toCharArray());
        SSLContext tls = SSLContext.getInstance("TLS");
        tls.init(kmf.getKeyManagers(), null, null);
        HttpsServer server = HttpsServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.setHttpsConfigurator(new HttpsConfigurator(tls));
        AtomicInteger calls = new AtomicInteger();
        server.createContext("/hook", ex -> {
            calls.incrementAndGet();
            ex.getRequestBody().readAllBytes();
            ex.sendResponseHeaders(204, -1);
            ex.close();
        });
        server.start();
        int port = server.getAddress().getPort();
        try {
            String url = "https://localhost:" + port + "/hook";
            try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 60, Map.of(), ca.caPem.toString(), null, null))) {
                assertEquals(Destination.Result.DELIVERED, s.send(1, EVENT).get());
            }
            assertEquals(1, calls.get());
            try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5))) {
                Destination.Result r = s.send(1, EVENT).get();
                assertEquals(Destination.Status.RETRY, r.status());
                assertTrue(r.detail().contains("certification path"), r.detail());
            }
            // 127.0.0.1 is in the certificate, 127.0.0.2 is not
            String otherName = "https://127.0.0.2:" + port + "/hook";
            HttpsServer other = HttpsServer.create(new InetSocketAddress("127.0.0.2", port), 0);
            other.setHttpsConfigurator(new HttpsConfigurator(tls));
            other.createContext("/hook", ex -> {
                calls.incrementAndGet();
                ex.sendResponseHeaders(204, -1);
                ex.close();
            });
            other.start();
            try (WebhookSender s = new WebhookSender(new WebhookConfig(otherName, 5, 60, Map.of(), ca.caPem.toString(), null, null))) {
                Destination.Result r = s.send(1, EVENT).get();
                assertEquals(Destination.Status.RETRY, r.status(), r.detail());
                assertTrue(r.detail().contains("127.0.0.2"), r.detail());
            } finally {
                other.stop(0);
            }
            assertEquals(1, calls.get(), "neither refused handshake reached the handler");
        } finally {
            server.stop(0);
        }
    }
}
