import { PageHeader } from "@/components/layouts/page-header";
import { TextLink } from "@/components/ui/link";
import { paths } from "@/config/paths";

/** No screen lives at this address (yet). */
export default function NotFoundRoute() {
  return (
    <>
      <title>Not found · Lotwise</title>
      <PageHeader title="Nothing at this address" lead="The link may be mistyped, or point at a screen that is not built yet." />
      <p className="font-mono text-sm text-ink-400">404</p>
      <p className="mt-4 text-sm">
        <TextLink to={paths.app.root.getHref()}>Back to the start</TextLink>
      </p>
    </>
  );
}
