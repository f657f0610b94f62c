import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));

/** Eleventy configuration: templates/ in, pages out; data arrives as the `wb` global from the build driver. */
export default function (eleventyConfig) {
  eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true, throwOnUndefined: true, trimBlocks: true, lstripBlocks: true });
  eleventyConfig.addPassthroughCopy({ [path.join(root, "templates", "assets")]: "assets" });
  eleventyConfig.setQuietMode(true);
  // Installed as a package, templates/ lies under node_modules/, which Eleventy skips by default;
  // and the lab's .gitignore (read from the working folder) has no say over our templates.
  eleventyConfig.ignores.delete("**/node_modules/**");
  eleventyConfig.setUseGitIgnore(false);
  return {
    dir: { input: "templates", includes: "_includes", output: "site" },
    templateFormats: ["njk"],
    htmlTemplateEngine: "njk",
  };
}
