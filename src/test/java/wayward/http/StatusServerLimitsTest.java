package wayward.http;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.Socket;
import java.net.SocketException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.delivery.RecentEvents;

/**
 * The status server against clients that hold connections, over real loopback sockets: a client trickling its
 * headers is closed at the request deadline, and connections beyond the cap are closed at once while /health
 * stays answered for others.
 */
@Timeout(value = 60, unit = TimeUnit.SECONDS)
class StatusServerLimitsTest {
    private static final StatusSource NOTHING = new EmptySite(new RecentEvents(10));

    private static HttpConfig loopback(int maxConnections) {
        return new HttpConfig("127.0.0.1", 0, null, null, maxConnections);
    }

    private static Socket connect(StatusServer s) throws IOException {
        Socket c = new Socket(InetAddress.getLoopbackAddress(), s.port());
        c.setSoTimeout(20_000);
        return c;
    }

    /** True when the server closed the connection: a read ends (-1) or the connection was reset. */
    private static boolean closedByServer(Socket c) throws IOException {
        try {
            InputStream in = c.getInputStream();
            while (in.read() >= 0) {
                // an answer may come first
            }
            return true;
        } catch (SocketException reset) {
            return true;
        }
    }

    private static String health(StatusServer s) throws IOException {
        try (Socket c = connect(s)) {
            c.getOutputStream().write("GET /health HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n"
                    .getBytes(StandardCharsets.US_ASCII));
            return new String(c.getInputStream().readAllBytes(), StandardCharsets.US_ASCII);
        }
    }

    @Test
    void aClientTricklingItsHeadersIsClosedAtTheDeadline() throws Exception {
        try (StatusServer s = StatusServer.start(loopback(10), NOTHING, 1); Socket c = connect(s)) {
            OutputStream out = c.getOutputStream();
            out.write("GET /health HTTP/1.1\r\n".getBytes(StandardCharsets.US_ASCII));
            int sent = 0;
            try {
                // one header byte every 200 ms never lets the connection go idle; a request never completes
                for (; sent < 40; sent++) {
                    out.write('X');
                    out.flush();
                    Thread.sleep(200);
                }
            } catch (SocketException closed) {
                // the server closed it while we were still trickling
            }
            assertTrue(sent < 40 || closedByServer(c), "still open after 8 s of trickling");
            assertTrue(health(s).startsWith("HTTP/1.1 200"), "others are still served");
        }
    }

    @Test
    void connectionsBeyondTheCapAreClosedAtOnceAndHealthStaysAnswered() throws Exception {
        try (StatusServer s = StatusServer.start(loopback(3), NOTHING, 30)) {
            List<Socket> held = new ArrayList<>();
            try {
                for (int i = 0; i < 3; i++) {
                    held.add(connect(s));
                }
                try (Socket fourth = connect(s)) {
                    assertTrue(closedByServer(fourth), "the fourth connection was served");
                }
                held.remove(0).close();
                // the cap counts a connection until the server has seen it close: ask until one gets through
                String answer = "";
                for (int i = 0; i < 50 && !answer.startsWith("HTTP/1.1 200"); i++) {
                    answer = health(s);
                }
                assertTrue(answer.startsWith("HTTP/1.1 200"), answer);
            } finally {
                for (Socket h : held) {
                    h.close();
                }
            }
        }
    }
}
