package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.sun.net.httpserver.HttpServer;
import java.io.IOException;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;

/**
 * Delivery to a real HTTP server on loopback: the JDK's own com.sun.net.httpserver, an HTTP/1.1
 * implementation independent of Netty.
 */
@Timeout(value = 30, unit = TimeUnit.SECONDS)
class WebhookSenderTest {
    private HttpServer server;
    private final List<String> bodies = new CopyOnWriteArrayList<>();
    private final List<String> ids = new CopyOnWriteArrayList<>();
    private final AtomicInteger calls = new AtomicInteger();
    private final List<String> signatures = new CopyOnWriteArrayList<>();
    private final List<String> timestamps = new CopyOnWriteArrayList<>();

    private static final Event EVENT = new Event("7d1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
            Event.Phase.START, 12.3, Instant.parse("2026-12-02T10:00:00Z"), 180, 45, 0.04, Double.NaN);
    private static final Event EVENT_END = new Event("7d1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
            Event.Phase.END, 16.8, Instant.parse("2026-12-02T10:00:04.5Z"), 180, 45, 0.06, 4.5);
    private final List<String> authorizations = new CopyOnWriteArrayList<>();
    /** What the receiver answers in its body. */
    private byte[] answerBody = "ok".getBytes(StandardCharsets.UTF_8);
    @TempDir
    Path outboxDir;

    /** Starts a receiver whose n-th answer (0-based) is statuses[min(n, last)]; -1 answers only after 2 s. */
    private String receiver(int... statuses) throws IOException {
        server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.setExecutor(java.util.concurrent.Executors.newFixedThreadPool(2));
        server.createContext("/hook", exchange -> {
            int n = calls.getAndIncrement();
            bodies.add(new String(exchange.getRequestBody().readAllBytes(), StandardCharsets.UTF_8));
            ids.add(exchange.getRequestHeaders().getFirst(WebhookSender.EVENT_ID_HEADER));
            String sig = exchange.getRequestHeaders().getFirst(WebhookSignature.SIGNATURE_HEADER);
            String ts = exchange.getRequestHeaders().getFirst(WebhookSignature.TIMESTAMP_HEADER);
            signatures.add(sig == null ? "" : sig);
            timestamps.add(ts == null ? "" : ts);
            String auth = exchange.getRequestHeaders().getFirst("Authorization");
            authorizations.add(auth == null ? "" : auth);
            int status = statuses[Math.min(n, statuses.length - 1)];
            if (status < 0) {
                try {
                    Thread.sleep(2000);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
                status = 503;
            }
            byte[] answer = answerBody;
            exchange.sendResponseHeaders(status, answer.length);
            exchange.getResponseBody().write(answer);
            exchange.close();
        });
        server.start();
        return "http://127.0.0.1:" + server.getAddress().getPort() + "/hook";
    }

    @AfterEach
    void stop() {
        if (server != null) {
            server.stop(0);
        }
    }

    /** Publishes the events through a bus with an outbox and this webhook, then closes it. */
    private Courier deliverThroughOutbox(WebhookConfig config, long closeAfterMillis, Event... events) throws Exception {
        EventBus bus = new EventBus();
        bus.useOutbox(Outbox.open(outboxDir, 1 << 20, 1 << 16));
        Courier c = bus.add(new WebhookSender(config), 10, 40);
        for (Event e : events) {
            bus.publish(e);
        }
        bus.close(closeAfterMillis);
        return c;
    }

    @Test
    void retriesAfter500AndATimeoutUntil200() throws Exception {
        String url = receiver(500, -1, 200);
        Courier c = deliverThroughOutbox(new WebhookConfig(url, 0.5), 10_000, EVENT);
        assertEquals(3, calls.get(), "500, no answer in time, 200");
        assertEquals(EventJson.toJson(EVENT), bodies.get(2));
        assertEquals("7d1c", ids.get(2));
        assertEquals(1, c.delivered());
        assertEquals(2, c.retries());
    }

    @Test
    void signedPostsVerifyWithTheSharedSecret() throws Exception {
        String url = receiver(200);
        byte[] secret = "yard-hook-secret".getBytes(StandardCharsets.UTF_8);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 60, Map.of(), null, "hook.secret", secret))) {
            assertEquals(Destination.Status.DELIVERED, s.send(1, EVENT).get().status());
        }
        // the receiver's check, written as the README describes it, with the JDK's javax.crypto directly
        javax.crypto.Mac mac = javax.crypto.Mac.getInstance("HmacSHA256");
        mac.init(new javax.crypto.spec.SecretKeySpec(secret, "HmacSHA256"));
        byte[] expected = mac.doFinal((timestamps.get(0) + "." + bodies.get(0)).getBytes(StandardCharsets.UTF_8));
        StringBuilder hex = new StringBuilder("sha256=");
        for (byte b : expected) {
            hex.append(String.format("%02x", b));
        }
        assertEquals(hex.toString(), signatures.get(0));
        long age = System.currentTimeMillis() / 1000 - Long.parseLong(timestamps.get(0));
        org.junit.jupiter.api.Assertions.assertTrue(age >= 0 && age < 60, "timestamp age " + age + " s");
    }

    @Test
    void unsignedWithoutASecretAndWithTheConfiguredHeaders() throws Exception {
        String url = receiver(200);
        WebhookConfig config = new WebhookConfig(url, 5, 60, Map.of("Authorization", "Bearer yard-ops-7"), null,
                null, null);
        try (WebhookSender s = new WebhookSender(config)) {
            assertEquals(Destination.Status.DELIVERED, s.send(1, EVENT).get().status());
        }
        assertEquals("", signatures.get(0));
        assertEquals("Bearer yard-ops-7", authorizations.get(0));
    }

    @Test
    void aClientErrorIsRefusedForGoodAndTheNextEventStillGoes() throws Exception {
        String url = receiver(404, 200);
        Courier c = deliverThroughOutbox(new WebhookConfig(url, 5), 10_000, EVENT, EVENT_END);
        assertEquals(2, calls.get(), "404 not retried");
        assertEquals(1, c.refused());
        assertEquals(1, c.delivered());
    }

    @Test
    void aRefusedPhaseIsKeptOnDiskBesideTheOutbox() throws Exception {
        String url = receiver(404, 200);
        Courier c = deliverThroughOutbox(new WebhookConfig(url, 5), 10_000, EVENT, EVENT_END);
        assertEquals(1, c.refused());
        List<String> kept = java.nio.file.Files.readAllLines(setAsideFile());
        assertEquals(1, kept.size());
        org.junit.jupiter.api.Assertions.assertTrue(kept.get(0).startsWith("{\"seq\":1,\"reason\":\"HTTP 404\",\"event\":"
                + EventJson.toJson(EVENT)), kept.get(0));
    }

    @Test
    void aTwoHundredWithAHugeBodyIsDelivered() throws Exception {
        // RFC 9110 §15.3: any 2xx is success, whatever the body; 256 KiB is four times what the sender used to hold
        answerBody = new byte[256 * 1024];
        String url = receiver(200);
        Courier c = deliverThroughOutbox(new WebhookConfig(url, 5), 10_000, EVENT);
        assertEquals(1, calls.get());
        assertEquals(1, c.delivered());
        assertEquals(0, c.retries());
    }

    @Test
    void aRecordThatCannotBeSentIsSetAsideAndTheQueueGoesOn() throws Exception {
        // a header value with CR LF (what check refuses; here straight into the sender): Netty will not write it
        String url = receiver(200);
        WebhookConfig config = new WebhookConfig(url, 5, 60, Map.of("X-Site", "yard\r\nX-Injected: 1"), null, null,
                null);
        Courier c = deliverThroughOutbox(config, 10_000, EVENT, EVENT_END);
        assertEquals(0, calls.get());
        assertEquals(2, c.refused(), "both phases set aside; the courier did not stop at the first");
        assertEquals(3, c.next(), "progress past both");
        List<String> kept = java.nio.file.Files.readAllLines(setAsideFile());
        assertEquals(2, kept.size());
        org.junit.jupiter.api.Assertions.assertTrue(kept.get(1).contains("cannot be sent"), kept.get(1));
    }

    private Path setAsideFile() throws IOException {
        try (java.util.stream.Stream<Path> files = java.nio.file.Files.list(outboxDir)) {
            return files.filter(f -> f.getFileName().toString().startsWith("set-aside-")).findFirst().orElseThrow();
        }
    }

    @Test
    void tooManyRequestsIsRetried() throws Exception {
        String url = receiver(429, 429, 200);
        Courier c = deliverThroughOutbox(new WebhookConfig(url, 5), 10_000, EVENT);
        assertEquals(3, calls.get());
        assertEquals(1, c.delivered());
    }

    @Test
    void whatAnUnreachableReceiverMissedWaitsInTheOutboxForTheNextStart() throws Exception {
        // a listening socket that never answers: every attempt times out (a free port would not do: a client
        // can connect to itself there, since the port lies in the ephemeral range)
        java.net.ServerSocket silent = new java.net.ServerSocket(0, 50, java.net.InetAddress.getLoopbackAddress());
        int port = silent.getLocalPort();
        String url = "http://127.0.0.1:" + port + "/hook";
        Courier down;
        try {
            down = deliverThroughOutbox(new WebhookConfig(url, 0.5), 1500, EVENT, EVENT_END);
        } finally {
            silent.close();
        }
        assertEquals(0, down.delivered());
        assertEquals(1, down.next(), "progress still before the first phase");
        // the receiver comes up on that port; the next start delivers both, in order
        server = HttpServer.create(new InetSocketAddress("127.0.0.1", port), 0);
        server.createContext("/hook", exchange -> {
            calls.incrementAndGet();
            bodies.add(new String(exchange.getRequestBody().readAllBytes(), StandardCharsets.UTF_8));
            exchange.sendResponseHeaders(204, -1);
            exchange.close();
        });
        server.start();
        Courier up = deliverThroughOutbox(new WebhookConfig(url, 1), 10_000);
        assertEquals(2, up.delivered());
        assertEquals(List.of(EventJson.toJson(EVENT), EventJson.toJson(EVENT_END)), bodies);
    }
}
