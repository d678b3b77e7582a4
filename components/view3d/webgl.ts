/**
 * Whether this browser can make the WebGL 2 context the 3-D view needs, and whether it renders in
 * software (no GPU: SwiftShader, llvmpipe), where the view draws without multisampling. Checked
 * when a view is opened (never on page load); the trial context is released at once.
 */
export function webglSupport(): { ok: boolean; software: boolean } {
  try {
    const canvas = document.createElement("canvas");
    const gl = canvas.getContext("webgl2");
    if (!gl) return { ok: false, software: false };
    const info = gl.getExtension("WEBGL_debug_renderer_info");
    const renderer = String(info ? gl.getParameter(info.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
    gl.getExtension("WEBGL_lose_context")?.loseContext();
    return { ok: true, software: /swiftshader|llvmpipe|software|softpipe/i.test(renderer) };
  } catch {
    return { ok: false, software: false };
  }
}

export const hasWebGL = (): boolean => webglSupport().ok;
