package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/** A status server that cannot bind fails the start: one line naming the address and the reason, exit 1. */
class StatusPortTakenTest {
    @TempDir
    Path dir;

    @Test
    @Timeout(60)
    void runExitsWithOneLineNamingTheAddressWhenThePortIsTaken() throws Exception {
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            int port = taken.getLocalPort();
            Path data = dir.resolve("data");
            Path config = dir.resolve("site.toml");
            Files.writeString(config, String.join("\n",
                    "[service]",
                    "data_dir = \"" + data.toString().replace("\\", "\\\\") + "\"",
                    "http = \"127.0.0.1:" + port + "\"",
                    "",
                    "[[camera]]",
                    "id = \"yard-mast-2\"",
                    "source = \"" + Path.of("test-streams/yard-lane.mp4").toAbsolutePath() + "\"",
                    "",
                    "  [[camera.zone]]",
                    "  id = \"lane-2-out\"",
                    "  polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]",
                    "  heading_deg = 0",
                    ""), StandardCharsets.UTF_8);
            ByteArrayOutputStream out = new ByteArrayOutputStream();
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int code = Main.execute(new String[] {"run", "--config", config.toString()},
                    new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
            // "Address already in use" is the JDK's text for EADDRINUSE (java.net.BindException, Linux strerror)
            assertEquals("wayward run: status server: 127.0.0.1:" + port + ": address already in use (set [service] "
                    + "http to another address, or to \"off\")\n", err.toString(StandardCharsets.UTF_8));
            assertEquals(Main.FAILED, code);
            // the bind comes first: no camera ran, nothing was written to the data folder
            assertFalse(Files.exists(data.resolve("events.jsonl")), "event log written although the start failed");
        }
    }
}
