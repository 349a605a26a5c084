import { useRouter } from 'expo-router';
import jsQR from 'jsqr';
import React, { useCallback, useEffect, useRef, useState } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { parseLabelCode } from '../../shared/labelCode';
import { colors, radius } from '../theme';
import { Button, Card, Field, Notice, Screen, T } from '../ui';

/** The label code from a scanned QR text (the check address …/l/<code>) or from what was typed, as printed. */
export const codeFromScan = parseLabelCode;

function Camera({ onCode }: { onCode: (code: string) => void }) {
  const videoRef = useRef<HTMLVideoElement | null>(null);
  const supported = typeof navigator !== 'undefined' && typeof navigator.mediaDevices?.getUserMedia === 'function';
  const [error, setError] = useState<string | null>(
    supported ? null : 'This browser cannot use the camera. Type the code instead.',
  );
  useEffect(() => {
    if (!supported) return;
    let stream: MediaStream | null = null;
    let timer: ReturnType<typeof setInterval> | null = null;
    let stopped = false;
    const canvas = document.createElement('canvas');
    const start = async () => {
      try {
        stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: 'environment' }, audio: false });
      } catch {
        setError('The camera is not available here (no camera, or permission was refused). Type the code instead.');
        return;
      }
      if (stopped) return stream.getTracks().forEach((t) => t.stop());
      const video = videoRef.current;
      if (!video) return;
      video.srcObject = stream;
      await video.play().catch(() => undefined);
      timer = setInterval(() => {
        if (!video.videoWidth) return;
        canvas.width = video.videoWidth;
        canvas.height = video.videoHeight;
        const g = canvas.getContext('2d');
        if (!g) return;
        g.drawImage(video, 0, 0);
        const img = g.getImageData(0, 0, canvas.width, canvas.height);
        const qr = jsQR(img.data, img.width, img.height);
        const code = qr ? codeFromScan(qr.data) : null;
        if (code) onCode(code);
      }, 300);
    };
    void start();
    return () => {
      stopped = true;
      if (timer) clearInterval(timer);
      stream?.getTracks().forEach((t) => t.stop());
    };
  }, [onCode, supported]);
  if (error)
    return (
      <Notice tone="warning" testID="camera-unavailable">
        {error}
      </Notice>
    );
  return (
    <View style={styles.camera}>
      {React.createElement('video', {
        ref: videoRef,
        playsInline: true,
        muted: true,
        style: { width: '100%', height: '100%', objectFit: 'cover' },
      })}
    </View>
  );
}

/** Scan a label's QR code with the camera where the browser allows it, or type the code printed under it. */
export function ScanScreen() {
  const router = useRouter();
  const [typed, setTyped] = useState('');
  const [error, setError] = useState<string | undefined>();
  const [camera, setCamera] = useState(false);
  const open = useCallback((code: string) => router.push(`/labels/${code.toUpperCase()}`), [router]);
  const submit = () => {
    const code = codeFromScan(typed);
    if (!code) return setError('Enter the 16-character code printed under the QR code');
    open(code);
  };
  return (
    <Screen title="Check a label" subtitle="Scan the QR code on the label, or type the code printed under it.">
      {Platform.OS === 'web' ? (
        <Card>
          <T variant="subheading">Camera</T>
          {camera ? (
            <Camera onCode={open} />
          ) : (
            <Button title="Scan with the camera" testID="start-camera" onPress={() => setCamera(true)} />
          )}
          <T variant="small">Hold the label’s QR code inside the frame; it opens as soon as it is read.</T>
        </Card>
      ) : null}
      <Card>
        <T variant="subheading">Type the code</T>
        <Field
          label="Label code"
          testID="label-code"
          value={typed}
          onChangeText={setTyped}
          autoCapitalize="characters"
          error={error}
          onSubmitEditing={submit}
          hint="16 characters as printed under the QR code, e.g. 7K2M Q9XD 4TRV B1PH (spaces, dashes and lower case are fine)"
        />
        <Button title="Open the label" testID="open-label" onPress={submit} />
      </Card>
      <T variant="small" style={styles.note}>
        The label page says whether the label is current, superseded or past review.
      </T>
    </Screen>
  );
}

const styles = StyleSheet.create({
  camera: {
    borderRadius: radius.lg,
    overflow: 'hidden',
    backgroundColor: '#000',
    aspectRatio: 1,
    maxWidth: 480,
    width: '100%',
    alignSelf: 'center',
  },
  note: { color: colors.muted },
});
