/**
 * A drawing's SVG text as a PNG, for "save as PNG": the SVG is loaded as an image and painted on a
 * canvas at `scale` device pixels per CSS pixel (2 gives a sharp picture for slides and documents).
 * The same SVG the report and "save as SVG" use, so the picture never differs from them; nothing
 * is scraped from the live chart. Self-contained on purpose (no imports): it runs in the page only.
 */
export async function svgToPngBlob(svgText: string, width: number, height: number, scale = 2, background = '#ffffff'): Promise<Blob> {
  const url = URL.createObjectURL(new Blob([svgText], { type: 'image/svg+xml' }));
  try {
    const image = new Image();
    image.decoding = 'sync';
    await new Promise<void>((resolve, reject) => {
      image.onload = () => resolve();
      image.onerror = () => reject(new Error('the drawing could not be loaded as an image'));
      image.src = url;
    });
    const canvas = document.createElement('canvas');
    canvas.width = Math.max(1, Math.round(width * scale));
    canvas.height = Math.max(1, Math.round(height * scale));
    const context = canvas.getContext('2d');
    if (!context) throw new Error('no 2D canvas in this browser');
    context.fillStyle = background;
    context.fillRect(0, 0, canvas.width, canvas.height);
    context.drawImage(image, 0, 0, canvas.width, canvas.height);
    return await new Promise<Blob>((resolve, reject) => canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('the PNG could not be made'))), 'image/png'));
  } finally {
    URL.revokeObjectURL(url);
  }
}
