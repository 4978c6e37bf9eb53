import { useActionData } from "react-router";
import type { Route } from "./+types/catalogue.products.new";
import { ProductEditor } from "~/components/product-editor";
import type { ProductResult } from "~/lib/catalogue";
import { productEditorAction, productEditorLoader } from "~/models/product-editor.server";

export const loader = (args: Route.LoaderArgs) => productEditorLoader(args);
export const action = (args: Route.ActionArgs) => productEditorAction(args);

export default function NewProduct({ loaderData }: Route.ComponentProps) {
  const result = useActionData<typeof action>() as ProductResult | undefined;
  return <ProductEditor {...loaderData} result={result} />;
}
