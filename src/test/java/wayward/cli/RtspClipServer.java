package wayward.cli;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

/**
 * The loopback RTSP server of the integration tests (src/test/resources/rtsp/serve-clip.py: GStreamer's RTSP server
 * through python3-gi) serving one clip at rtsp://127.0.0.1:PORT/clip. Its output after the first line is copied to
 * the test's output (the failsafe report), so that the pipe never fills and blocks it, and a failure shows what the
 * server said.
 */
final class RtspClipServer {
    private RtspClipServer() {
    }

    /** A port free a moment ago (another process may still take it before the server binds it). */
    static int freePort() throws IOException {
        try (ServerSocket s = new ServerSocket(0)) {
            return s.getLocalPort();
        }
    }

    /**
     * Starts the server on {@code port}; returns once it listens, or null when it could not bind the port (it said
     * so and ended). Fails when it says anything else.
     */
    static Process start(int port, Path clip) throws IOException {
        Path script = ProcessRunner.projectDir().resolve("src/test/resources/rtsp/serve-clip.py");
        Process p = new ProcessBuilder("/usr/bin/python3", script.toString(), Integer.toString(port), clip.toString())
                .redirectErrorStream(true).start();
        BufferedReader r = new BufferedReader(new InputStreamReader(p.getInputStream(), StandardCharsets.UTF_8));
        String line = r.readLine(); // blocks until the server says it listens (or dies)
        if (line != null && line.startsWith("cannot listen")) {
            p.destroyForcibly();
            return null;
        }
        if (line == null || !line.startsWith("serving")) {
            p.destroyForcibly();
            throw new AssertionError("RTSP server did not start: " + line);
        }
        Thread drain = new Thread(() -> {
            try {
                for (String l; (l = r.readLine()) != null; ) {
                    System.out.println("[rtsp " + port + "] " + l);
                }
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }, "rtsp-" + port + "-output");
        drain.setDaemon(true);
        drain.start();
        return p;
    }

    /** As {@link #start}, failing the test when the port could not be bound (a port the test must keep). */
    static Process startOn(int port, Path clip) throws IOException {
        Process p = start(port, clip);
        if (p == null) {
            throw new AssertionError("RTSP server could not listen on port " + port);
        }
        return p;
    }

    /** A server on a port of its own: tries up to three free ports. */
    static Started startOnFreePort(Path clip) throws IOException {
        for (int attempt = 0; attempt < 3; attempt++) {
            int port = freePort();
            Process p = start(port, clip);
            if (p != null) {
                return new Started(port, p);
            }
        }
        throw new AssertionError("RTSP server could not listen on three free ports in a row");
    }

    /** A running server and its port. */
    record Started(int port, Process process) {
    }
}
