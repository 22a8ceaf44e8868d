package wayward.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.image.GrayFrame;

/**
 * A camera whose server accepts the connection and never answers must not hold up the others: each camera opens
 * its source on its own thread, and none waits for another's open. Shown by order, not by a stopwatch: a file
 * camera started after three hung RTSP cameras have connected delivers its first picture while all three are
 * still stuck in their open (none has been declared lost yet). Before the fix every open waited on one lock
 * inside JavaCV's grabber start, so the file camera waited for a hung open to time out first.
 */
class HungSourceTest {
    @TempDir
    Path dir;

    /** A TCP server on loopback that accepts every connection and never sends a byte. */
    private static final class SilentServer implements AutoCloseable {
        final ServerSocket socket = new ServerSocket(0, 50, InetAddress.getLoopbackAddress());
        final List<Socket> held = new CopyOnWriteArrayList<>();
        final Semaphore accepted = new Semaphore(0);
        final Thread thread = new Thread(this::serve, "silent-server");

        SilentServer() throws IOException {
            thread.setDaemon(true);
            thread.start();
        }

        private void serve() {
            try {
                while (true) {
                    held.add(socket.accept());
                    accepted.release();
                }
            } catch (IOException e) {
                // closed
            }
        }

        @Override
        public void close() throws IOException {
            socket.close();
            for (Socket s : held) {
                s.close();
            }
        }
    }

    /** A three-frame uncompressed YUV4MPEG2 file of mid grey. */
    private Path file() throws IOException {
        Path f = dir.resolve("grey.y4m");
        int w = 64;
        int h = 48;
        byte[] plane = new byte[w * h * 3 / 2];
        java.util.Arrays.fill(plane, (byte) 128);
        try (OutputStream out = Files.newOutputStream(f)) {
            out.write(("YUV4MPEG2 W" + w + " H" + h + " F15:1 Ip A1:1 C420jpeg\n").getBytes(StandardCharsets.US_ASCII));
            for (int i = 0; i < 3; i++) {
                out.write("FRAME\n".getBytes(StandardCharsets.US_ASCII));
                out.write(plane);
            }
        }
        return f;
    }

    private static Thread run(VideoSource s, String name) {
        Thread t = new Thread(s, name);
        t.setDaemon(true); // a hung open ends only at FFmpeg's socket timeout; the test does not wait for it
        t.start();
        return t;
    }

    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void aHungCameraDoesNotHoldUpTheOthers() throws Exception {
        AtomicInteger lost = new AtomicInteger();
        VideoSource.Health health = new VideoSource.Health() {
            @Override
            public void lost(String reason, double streamSeconds) {
                lost.incrementAndGet();
            }

            @Override
            public void back(double streamSeconds) {
            }
        };
        List<VideoSource> hung = new ArrayList<>();
        try (SilentServer server = new SilentServer()) {
            String url = "rtsp://127.0.0.1:" + server.socket.getLocalPort() + "/lane";
            for (int i = 0; i < 3; i++) {
                VideoSource s = new VideoSource("hung-" + i, new SourceOptions(url, false, false, 64, 15, 0,
                        SourceInput.DEFAULTS), new FrameSlot(false), health, null);
                hung.add(s);
                run(s, "capture-hung-" + i);
            }
            // all three are inside their open once each has connected (with one shared lock only one could)
            server.accepted.acquire(3);
            FrameSlot slot = new FrameSlot(true);
            VideoSource good = new VideoSource("good", new SourceOptions(file().toString(), false, false, 64, 1000, 0,
                    SourceInput.DEFAULTS), slot, health, null);
            run(good, "capture-good");
            GrayFrame first = slot.take(60_000);
            int lostWhenFirst = lost.get();
            assertNotNull(first, "the file camera delivered no picture");
            assertEquals(0, lostWhenFirst, "a hung open ended (its camera declared lost) before the file camera's "
                    + "first picture: the opens waited on each other");
        } finally {
            hung.forEach(VideoSource::stop);
        }
    }
}
